using Orchard.Core.Demo;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>One seed, one schedule, however many threads plan it: byte-identical at 1, 2 and 4 threads (the statistics' timings aside).</summary>
public sealed class ThreadCountDeterminismTests
{
    [Theory]
    [InlineData(0)]
    [InlineData(9)]
    public void Schedules_are_byte_identical_at_1_2_and_4_threads(int tree)
    {
        var arm = DemoArm.Create();
        var scan = DemoOrchard.Generate(new DemoOrchardSettings(Seed: 29, TreesPerRow: 2)).Trees[tree].Scan;
        string At(int threads)
        {
            var (schedule, state) = TreeSequencer.Plan(scan, arm, SequencingSettings.Default with { Parallelism = threads }, TimeProvider.System, CancellationToken.None);
            var steps = schedule.AllSteps().ToArray();
            var replan = steps.Length < 3 ? "" : OrchardJson.Serialize(TreeSequencer.Replan(scan, arm, state,
                new ReplanRequest(steps[2].CutConfiguration, steps.Take(2).Select(s => s.CutId).ToArray(), [], steps[2].CutId, RetryPolicy.RetryLast, schedule.Stops.First(s => s.Steps.Contains(steps[2])).ArmBase),
                2, SequencingSettings.Default with { Parallelism = threads }, TimeProvider.System, CancellationToken.None).Schedule with { Statistics = null! });
            return OrchardJson.Serialize(schedule with { Statistics = null! }) + "\n" + OrchardJson.Serialize(PlanStateDocument.From(state)) + "\n" + replan;
        }

        var one = At(1);
        Assert.Equal(one, At(2));
        Assert.Equal(one, At(4));
    }
}
