namespace Orchard.Core.Planning;

/// <summary>Settings of <see cref="RecursiveMidpointPlanner"/>. Defaults in brackets.</summary>
public sealed record RmpdSettings
{
    /// <summary>Plain (first free sample), cost-aware (weighted mean) or greedy (best sample) [cost-aware].</summary>
    public PlannerMethod Variant { get; init; } = PlannerMethod.CostAware;

    /// <summary>
    /// Deepest recursion; a segment still blocked there fails [5]. Deeper searches spent the check budget far down
    /// one branch before a retry near the top could find a better midpoint: on <c>bench moves</c> (4 demo trees)
    /// depth 7 with 3 retries and spread 0.25 solved 97.9 % of moves, depth 5 with 2 retries and spread 0.20 100 %,
    /// with 0.83× the checks.
    /// </summary>
    public int MaxDepth { get; init; } = 5;

    /// <summary>Collision checks one plan may spend [20,000].</summary>
    public long MaxCollisionChecks { get; init; } = 20_000;

    /// <summary>Gaussian spread as a share of the blocked segment's length, to start with [0.20] (see <see cref="MaxDepth"/>).</summary>
    public double InitialSpreadFraction { get; init; } = 0.20;

    /// <summary>Least spread, joint units, so very short segments still search [0.02].</summary>
    public double MinSpread { get; init; } = 0.02;

    /// <summary>The spread grows by this factor after a round with no free sample [1.6].</summary>
    public double SpreadGrowth { get; init; } = 1.6;

    /// <summary>New midpoints tried for one segment after the halves from the first could not be solved [2] (see <see cref="MaxDepth"/>).</summary>
    public int MidpointRetries { get; init; } = 2;

    /// <summary>
    /// A retry (the halves from the first midpoint could not be solved) takes the first free sample of its wider
    /// search, as the plain form does, rather than scoring samples (ours) [false]. Measured on bench moves (4 demo
    /// trees, this release's depth, retries and spread): success 100 % against 99.8 %, 0.84× the checks and p95 6.1 ms
    /// against 12.6 ms, but moves that execute 5 % slower; the arm's time is the field's, so the default scores
    /// retries too.
    /// </summary>
    public bool RetriesTakeFirstFree { get; init; }

    /// <summary>
    /// Each waypoint the recursion reaches short of the goal is tried straight to the goal, and the search ends
    /// there when that is free (ours, not the paper's: the recursion otherwise solves the rest of the midpoint tree it
    /// has built, which shortcutting then removes) [true]. On <c>bench moves</c> over 10 demo trees: success 100 %
    /// against 99.9 %, 0.89× the checks, p95 9.5 ms against 12.5 ms, the same execution time.
    /// </summary>
    public bool JoinGoalEarly { get; init; } = true;

    /// <summary>Each retry widens the spread by this factor [2.0].</summary>
    public double RetrySpreadGrowth { get; init; } = 2.0;

    /// <summary>Rounds of sampling around one midpoint before it fails [8].</summary>
    public int MaxRounds { get; init; } = 8;

    /// <summary>Samples per round, k [8].</summary>
    public int SamplesPerRound { get; init; } = 8;

    /// <summary>Cost-aware forms: rounds that re-centre on the weighted mean (or best sample) once free samples exist [3].</summary>
    public int CostIterations { get; init; } = 3;

    /// <summary>Clearance term: cost of a sample is <c>ClearanceWeight · max(0, 1 − clearance / ClearanceScaleM)</c> [1.0].</summary>
    public double ClearanceWeight { get; init; } = 1.0;

    /// <summary>Clearances beyond this cost nothing [0.10 m].</summary>
    public double ClearanceScaleM { get; init; } = 0.10;

    /// <summary>Smoothness term: <c>SmoothnessWeight · excess / |qa − qb|</c>, the triangle-inequality excess relative to the segment [1.0].</summary>
    public double SmoothnessWeight { get; init; } = 1.0;

    /// <summary>
    /// What the smoothness term's excess is measured in: the space's travel time (the slowest joint's, which is what
    /// execution pays) or its distance (radians, the paper's metric) [travel time].
    /// </summary>
    public DetourMeasure DetourMeasure { get; init; } = DetourMeasure.TravelTime;

    /// <summary>Keeps inverse-cost weights finite [1e-3].</summary>
    public double CostFloor { get; init; } = 1e-3;

    public static RmpdSettings Default { get; } = new();
}
