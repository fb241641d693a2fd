using Orchard.Core.Planning;
using Orchard.Core.Reachability;

namespace Orchard.Core.Sequencing;

/// <summary>Settings of <see cref="TreeSequencer"/>. Defaults in brackets.</summary>
public sealed record SequencingSettings
{
    /// <summary>All randomness of a tree's planning follows from this and the tree id [20261].</summary>
    public ulong Seed { get; init; } = 20261;

    /// <summary>Lazy evaluation or all pairs [lazy].</summary>
    public EvaluationMode Mode { get; init; } = EvaluationMode.Lazy;

    public MootPolicy Moot { get; init; } = MootPolicy.Drop;

    /// <summary>Candidates and their approaches [3 candidates per cut].</summary>
    public ReachabilitySettings Reachability { get; init; } = ReachabilitySettings.Default with { MaxCandidatesPerCut = 3 };

    public MovePlannerSettings Planner { get; init; } = MovePlannerSettings.Default;

    /// <summary>
    /// The ordering solver's solution limit per round, as a base plus so many per node; with it the
    /// solver is deterministic (its time limit below is only a safety cap) [40 + 1 per node].
    /// </summary>
    public int SolutionLimitBase { get; init; } = 40;

    /// <inheritdoc cref="SolutionLimitBase"/>
    public double SolutionLimitPerNode { get; init; } = 1.0;

    /// <summary>Safety cap on one solver round [2 s].</summary>
    public TimeSpan SolverTimeCap { get; init; } = TimeSpan.FromSeconds(2);

    /// <summary>Most solve-plan rounds of lazy evaluation [60].</summary>
    public int MaxLazyRounds { get; init; } = 60;

    /// <summary>Threads planning moves at once [all cores].</summary>
    public int Parallelism { get; init; } = Environment.ProcessorCount;

    /// <summary>The final approach and the retract run at this tool speed, reduced near the wood [0.15 m/s].</summary>
    public double ApproachSpeedMS { get; init; } = 0.15;

    /// <summary>… with this acceleration [0.6 m/s²].</summary>
    public double ApproachAccelerationMS2 { get; init; } = 0.6;

    /// <summary>
    /// After the order is fixed, plan each move again against the scene as it is then (wood cut off
    /// by earlier cuts gone) and keep it when faster [true]. Ordering itself uses the full tree (safe).
    /// </summary>
    public bool ReplanMovesAgainstCurrentScene { get; init; } = true;

    public static SequencingSettings Default { get; } = new();
}
