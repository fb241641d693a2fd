using System.Collections.Concurrent;
using Orchard.Core.Collision;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;
using Orchard.Core.Reachability;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Stops;

/// <summary>
/// What is known about one stand of one tree: the arm placed there, whether its stowed arm is clear of
/// everything (the measured clearance and what is nearest), each cut's reachability from there (analysed
/// on demand, each cut once), and the moves planned there. Reachability randomness is a stream per
/// (tree, stand, cut), so results do not depend on the order in which stands or cuts are analysed.
/// </summary>
public sealed class StandSurvey
{
    private readonly ConcurrentDictionary<int, CutReachability> _reach = new();
    private readonly ConcurrentDictionary<(int Cut, int Candidate), TimedApproach> _approaches = new();
    private ReachEnvelope? _envelope;

    public StandSurvey(WorkCell cell, Stand stand, MoveCache? moves = null, IEnumerable<CutReachability>? known = null, IReadOnlyList<string>? lastOrder = null)
    {
        LastOrder = lastOrder ?? [];
        Cell = cell ?? throw new ArgumentNullException(nameof(cell));
        Stand = stand ?? throw new ArgumentNullException(nameof(stand));
        Moves = moves ?? new MoveCache();
        foreach (var r in known ?? [])
        {
            _reach[r.CutIndex] = r;
        }

        var checker = cell.CreateChecker();
        StowReport = checker.Check(cell.Profile.StowConfiguration.ToArray());
        StowContact = ContactDescription.Of(cell, StowReport);
    }

    public WorkCell Cell { get; }

    public Stand Stand { get; }

    public MoveCache Moves { get; }

    /// <summary>The tour of the last schedule made here (node keys, the start left out): a re-plan's first tour.</summary>
    public IReadOnlyList<string> LastOrder { get; set; }

    /// <summary>The stowed arm's check at this stand: free or not, its clearance and what is nearest.</summary>
    public ConfigurationReport StowReport { get; }

    public ContactDescription StowContact { get; }

    public ReachEnvelope Envelope => _envelope ??= new ReachEnvelope(Cell);

    /// <summary>Can the arm work from here at all: the stowed arm free, with this much room?</summary>
    public bool StowClear(double clearanceM) => StowReport.IsFree && StowReport.ClearanceM >= clearanceM;

    public IReadOnlyDictionary<int, CutReachability> Known => _reach;

    public bool IsAnalysed(int cut) => _reach.ContainsKey(cut);

    /// <summary>Reachability of one cut from here (it must have been analysed).</summary>
    public CutReachability Reach(int cut) => _reach[cut];

    /// <summary>Analyses the given cuts not analysed yet, spread over threads.</summary>
    public void Analyse(IReadOnlyCollection<int> cuts, SequencingSettings settings, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(cuts);
        ArgumentNullException.ThrowIfNull(settings);
        var todo = cuts.Where(c => !_reach.ContainsKey(c)).Distinct().Order().ToArray();
        if (todo.Length == 0)
        {
            return;
        }

        var seed = StableHash.Of(settings.Seed, Cell.Scan.TreeId, "reach", Stand.Key);
        using var workers = new ThreadLocal<(CollisionChecker, InverseKinematics)>(() => (Cell.CreateChecker(), new InverseKinematics(Cell.Chain, settings.Reachability.InverseKinematics)));
        var results = new CutReachability[todo.Length];
        Parallel.For(0, todo.Length, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, settings.Parallelism), CancellationToken = cancellationToken }, k =>
        {
            var (checker, ik) = workers.Value;
            results[k] = ReachabilityAnalyzer.AnalyzeCut(Cell, checker, ik, settings.Reachability, todo[k], DeterministicRandom.ForStream(seed, (ulong)todo[k]));
        });
        foreach (var r in results)
        {
            _reach[r.CutIndex] = r;
        }
    }

    /// <summary>A candidate's timed approach, timed once per stand.</summary>
    public TimedApproach ApproachOf(CutCandidate candidate, Func<TimedApproach> time)
    {
        ArgumentNullException.ThrowIfNull(candidate);
        ArgumentNullException.ThrowIfNull(time);
        return _approaches.GetOrAdd((candidate.CutIndex, candidate.CandidateIndex), _ => time());
    }

    /// <summary>What a re-plan needs of this stand: every cut analysed so far and the moves planned here.</summary>
    public StandState ToState() => new(Stand, _reach.Values.OrderBy(r => r.CutIndex).ToArray(), Moves, LastOrder);

    /// <summary>Cuts of the given set this stand reaches (all must have been analysed).</summary>
    public IEnumerable<int> Reaching(IEnumerable<int> cuts) => cuts.Where(c => _reach.TryGetValue(c, out var r) && r.IsReachable);
}
