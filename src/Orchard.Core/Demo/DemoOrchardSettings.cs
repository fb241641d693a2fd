namespace Orchard.Core.Demo;

/// <summary>How much demo orchard to make, and from which seed.</summary>
/// <param name="Seed">Everything follows from it; one seed, one orchard, byte for byte.</param>
/// <param name="TreesPerRow">Trees exported per row (the rows themselves are longer); 4 gives 24 trees over 6 rows.</param>
public sealed record DemoOrchardSettings(ulong Seed = DemoOrchardSettings.DefaultSeed, int TreesPerRow = 4)
{
    public const ulong DefaultSeed = 4207;

    public const int MaxTreesPerRow = 500;
}
