using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// Every tree of the demo orchard for three seeds (the default one and two others), planned once and
/// shared by the tests that look at them.
/// </summary>
public sealed class DemoOrchardSchedules
{
    public const string Collection = "demo orchard schedules";

    public static readonly ulong[] Seeds = [DemoOrchardSettings.DefaultSeed, 11, 29];

    public DemoOrchardSchedules()
    {
        Arm = DemoArm.Create();
        Trees = Seeds.SelectMany(seed => DemoOrchard.Generate(new DemoOrchardSettings(seed)).Trees.Select(t => (Seed: seed, t.Scan)))
            .Select(t =>
            {
                var (schedule, state) = TreeSequencer.Plan(t.Scan, Arm, SequencingSettings.Default, TimeProvider.System, CancellationToken.None);
                return new PlannedTree(t.Seed, t.Scan, schedule, state);
            })
            .ToArray();
    }

    public ArmProfile Arm { get; }

    public IReadOnlyList<PlannedTree> Trees { get; }

    public sealed record PlannedTree(ulong Seed, TreeScan Scan, Schedule Schedule, TreePlanState State)
    {
        public override string ToString() => $"seed {Seed} tree {Scan.TreeId}";
    }
}

/// <summary>The test classes that share <see cref="DemoOrchardSchedules"/> (planned once for all of them).</summary>
[CollectionDefinition(DemoOrchardSchedules.Collection)]
public sealed class DemoOrchardSchedulesShared : ICollectionFixture<DemoOrchardSchedules>;
