using Orchard.Core.Planning;
using Orchard.Core.Reachability;
using Orchard.Core.Stops;

namespace Orchard.Core.Sequencing;

/// <summary>Settings of <see cref="TreeSequencer"/>. Defaults in brackets.</summary>
public sealed record SequencingSettings
{
    /// <summary>All randomness of a tree's planning follows from this and the tree id [20261].</summary>
    public ulong Seed { get; init; } = 20261;

    /// <summary>Lazy evaluation or all pairs [lazy].</summary>
    public EvaluationMode Mode { get; init; } = EvaluationMode.Lazy;

    public MootPolicy Moot { get; init; } = MootPolicy.Drop;

    /// <summary>Candidates and their approaches [3 candidates kept per cut, the search stopping at 4].</summary>
    public ReachabilitySettings Reachability { get; init; } = ReachabilitySettings.Default with { MaxCandidatesPerCut = 3, EnoughCandidates = 4 };

    /// <summary>
    /// The move planner, with budgets sized for ordering [cost-aware RMPD on 10,000 checks, then
    /// RRT-Connect on 30,000]: a move the lazy search asks about may well be impossible, and an
    /// impossible move costs the whole budget.
    /// </summary>
    public MovePlannerSettings Planner { get; init; } = MovePlannerSettings.Default with
    {
        Primary = RmpdSettings.Default with { MaxCollisionChecks = 10_000 },
        Fallback = RrtConnectSettings.Default with { MaxCollisionChecks = 30_000 },
    };

    /// <summary>
    /// Lazy evaluation first checks the straight line to each node's this many nearest candidates [8];
    /// 0 turns probing off (every move the tour uses is then planned in full at once).
    /// </summary>
    public int ProbeNeighbours { get; init; } = 8;

    /// <summary>
    /// A re-plan probes each node's this many nearest moves [24]: most are known from the first plan
    /// (free ones planned, blocked ones remembered), so this costs little and saves rounds.
    /// </summary>
    public int ReplanProbeNeighbours { get; init; } = 24;

    /// <summary>When a lazy round probes the tour's new moves, it also probes each tour node's this many nearest unprobed moves [0: measured to probe more without saving rounds].</summary>
    public int ProbeAroundTour { get; init; }

    /// <summary>
    /// When a tour still uses moves not looked at in this round, every move not looked at yet is probed at once
    /// (a straight-line check each) [8]; until then only the tour's [and its neighbours'] are.
    /// </summary>
    public int ProbeAllAfterRounds { get; init; } = 8;

    /// <summary>
    /// A pre-cut pose with this many moves to or from it planned in full and failed, and not one move found, is given
    /// up: its other moves count as unplannable without planning them [3; 0 never gives up]. Each failure spent both
    /// planners' whole budgets; a pose three other poses cannot reach sits in a pocket of the wood.
    /// </summary>
    public int GiveUpAfterFailedMoves { get; init; } = 3;

    /// <summary>
    /// A probed move whose straight line is blocked is guessed at this many times its straight-line time until
    /// planned [1.5]. Lower guesses let the tour try more blocked moves (each planned when it does): on 40-cut trees
    /// 1.5 brought schedules from 1.4 % to 0.6 % above all-pairs' at the median tree, for about a fifth more
    /// planning time than 2.
    /// </summary>
    public double BlockedGuessFactor { get; init; } = 1.5;

    /// <summary><see cref="BlockedGuessFactor"/> for a re-plan [2]: fewer moves to plan while the arm waits.</summary>
    public double ReplanBlockedGuessFactor { get; init; } = 2.0;

    /// <summary>Intermediate lazy rounds search with the solution limit divided by this; 1 searches fully every round [1].</summary>
    public int IntermediateSearchDivisor { get; init; } = 1;

    /// <summary>Safety cap on one solver round [2 s].</summary>
    public TimeSpan SolverTimeCap { get; init; } = TimeSpan.FromSeconds(2);

    /// <summary>
    /// Times a tour made of planned moves only is polished (greedy descents from other first tours, the best
    /// kept) before it is accepted [2]. Every round stops at a local optimum, so the time cap below is only a
    /// safety net and the result does not depend on the machine's speed.
    /// </summary>
    public int MaxPolishRounds { get; init; } = 2;

    /// <summary>
    /// <see cref="MaxPolishRounds"/> for a re-plan [0]: it starts from the stop's previous, already polished order,
    /// and the arm is waiting.
    /// </summary>
    public int ReplanPolishRounds { get; init; }

    /// <summary>
    /// A move the planners do not find is made of two found moves through a third pose (<c>via</c>), the
    /// cheapest such, and shortcut [true]. The arm passes that pose without cutting.
    /// </summary>
    public bool JoinFailedMoves { get; init; } = true;

    /// <summary>
    /// Moves to (from) a pose whose moves to (from) it failed this many times are joined through a third pose
    /// at once when one is known, not searched for [2; 0 always searches first]. Needs <see cref="JoinFailedMoves"/>.
    /// </summary>
    public int SearchesBeforeJoining { get; init; } = 2;

    /// <summary>
    /// Once this many of a stop's searches have failed, or one per cut at the stop when that is more, it searches
    /// no more [12; 0 for no such limit]: every move not planned yet counts as unplannable and the rounds settle the
    /// best tour of the moves found (a cut that tour cannot reach goes to another stop). Each failure spends both
    /// planners' whole budgets; a stop whose poses fall in groups no found move joins spent its rounds trying one
    /// new crossing after another. A longer tour needs more blocked moves: 12 alone left dense trees' schedules up
    /// to 2.7 % longer.
    /// </summary>
    public int MaxFailedSearches { get; init; } = 12;

    /// <summary>Most solve-plan rounds of lazy evaluation [60].</summary>
    public int MaxLazyRounds { get; init; } = 60;

    /// <summary>
    /// With a value, lazy evaluation ends, keeping the best tour of found moves seen so far, when a round's tour,
    /// its moves not planned yet counted at their guesses, promises less than this fraction below that best tour
    /// [null: the rounds go on until a tour uses planned moves only, or to <see cref="MaxLazyRounds"/>; the best
    /// tour is kept either way]. Measured on six 40-cut trees side by side: 0 and 0.005 planned fewer moves
    /// (7 against 14 on K3-001) but left schedules up to 1.1 % (0) and 2.6 % (0.005) dearer, and a guess can be pessimistic,
    /// so the promise is no bound.
    /// </summary>
    public double? LazyStopGain { get; init; }

    /// <summary>Threads planning moves at once [all cores].</summary>
    public int Parallelism { get; init; } = Environment.ProcessorCount;

    /// <summary>The final approach and the retract run at this tool speed, reduced near the wood [0.15 m/s].</summary>
    public double ApproachSpeedMS { get; init; } = 0.15;

    /// <summary>Out beyond the pre-cut pose (between it and the clear pose) the tool moves along the approach at up to this speed [0.3 m/s].</summary>
    public double ClearSpeedMS { get; init; } = 0.3;

    /// <summary>… with this acceleration [0.6 m/s²].</summary>
    public double ApproachAccelerationMS2 { get; init; } = 0.6;

    /// <summary>
    /// After the order is fixed, plan each move again against the scene as it is then (wood cut off
    /// by earlier cuts gone) and keep it when faster [true]. Ordering itself uses the full tree (safe).
    /// </summary>
    public bool ReplanMovesAgainstCurrentScene { get; init; } = true;

    /// <summary>
    /// Moves may pass through space that earlier cuts free, the wood having fallen [true]: such a move names
    /// the cuts it depends on (<c>dependsOnCuts</c>), and one the whole tree leaves no way for is planned that
    /// way rather than given up. False plans every move against the whole tree, assuming nothing falls (a cut
    /// whose only way is through fallen wood is then left out); <c>bench coverage --no-falling-wood</c>
    /// measures what that costs.
    /// </summary>
    public bool AssumeFallingWood { get; init; } = true;

    /// <summary>Where stops are looked for and what a stop costs.</summary>
    public StopSearchSettings Stops { get; init; } = StopSearchSettings.Default;

    /// <summary>
    /// Planning stops after this long (measured with the caller's clock) and the schedule planned so far
    /// is returned, marked partial, with the cuts not reached listed [none].
    /// </summary>
    public TimeSpan? Deadline { get; init; }

    /// <summary>Receives one line per lazy round, for diagnosis; null (the default) for none.</summary>
    public Action<string>? Trace { get; init; }

    public static SequencingSettings Default { get; } = new();
}
