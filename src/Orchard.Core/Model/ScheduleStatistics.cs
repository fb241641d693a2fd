namespace Orchard.Core.Model;

/// <summary>What planning a schedule took.</summary>
/// <param name="EdgesPlanned">Moves planned with the collision-aware planner for this schedule (new ones; reused ones not counted).</param>
/// <param name="EdgesProbed">Moves whose straight line alone was checked (free ones count as planned direct moves from then on).</param>
/// <param name="EdgesReused">Moves taken from earlier planning of the same tree.</param>
/// <param name="EdgesAllPairs">Moves all-pairs planning would need for the same candidates.</param>
/// <param name="SolverRounds">Times the ordering was solved (lazy evaluation re-solves after planning the tour's new moves).</param>
/// <param name="PlanSeconds">Wall time of the whole planning, as measured with the caller's clock.</param>
/// <param name="SolverSeconds">Of which the ordering solver (all rounds).</param>
/// <param name="MovePlanningSeconds">Of which planning moves (wall time of the parallel batches).</param>
/// <param name="StandsAnalysed">Stands whose reachability was analysed for at least one cut while choosing stops.</param>
public sealed record ScheduleStatistics(
    int CandidateNodes,
    int EdgesPlanned,
    int EdgesProbed,
    int EdgesReused,
    int EdgesAllPairs,
    int EdgesFailed,
    int SolverRounds,
    double PlanSeconds,
    double ReachabilitySeconds,
    double SolverSeconds,
    double MovePlanningSeconds,
    string Mode,
    int StandsAnalysed = 0);
