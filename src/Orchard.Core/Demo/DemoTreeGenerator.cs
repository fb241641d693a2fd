namespace Orchard.Core.Demo;

/// <summary>Placeholder type name referenced by documentation; filled in with the demo orchard.</summary>
public static class DemoTreeGenerator;
