using Orchard.Core.Model;

namespace Orchard.Core.Demo;

/// <summary>One generated tree: its scan as the tablet would post it, and the row it stands in.</summary>
public sealed record DemoTree(DemoRow Row, TreeScan Scan);
