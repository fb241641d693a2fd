namespace Orchard.Service.Tests;

/// <summary>
/// The fault, restart and load runs share one xunit collection, so they run one after another and never
/// load the two cores at the same time as each other (their figures stay readable; other tests may still
/// run beside them).
/// </summary>
[CollectionDefinition(Name)]
public sealed class ReliabilityRuns
{
    public const string Name = "Reliability runs";
}
