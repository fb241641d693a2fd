using System.Diagnostics.CodeAnalysis;
using Orchard.Core.Collision;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Answers "what does the move from node a to node b cost" for one stop: from the stop's move cache when
/// known, by checking the straight line (a probe), or by planning it in full with the collision-aware
/// planner against the whole tree. Counts what it did. Each move's randomness is a stream named by the
/// stand and its two ends, so the answer does not depend on the order moves are asked for.
/// </summary>
internal sealed class MoveOracle(WorkCell cell, string standKey, MoveCache cache, SequencingSettings settings, JointSpeedLimits limits, TimeProvider clock, CancellationToken cancellationToken) : IDisposable
{
    private readonly MovePlanner _planner = new(settings.Planner);
    private readonly ThreadLocal<CollisionChecker> _checkers = new(cell.CreateChecker);
    private readonly HashSet<(string, string)> _seen = [];
    private readonly System.Collections.Concurrent.ConcurrentDictionary<(string, string), TimedPath> _timed = new();
    private int _planned;
    private int _probed;
    private int _reused;
    private int _failed;
    private int _joined;

    public WorkCell Cell { get; } = cell;

    public JointSpeedLimits Limits { get; } = limits;

    public TimeProvider Clock { get; } = clock;

    public CancellationToken CancellationToken { get; } = cancellationToken;

    public SequencingSettings Settings { get; } = settings;

    public string StandKey { get; } = standKey;

    public double SolverSeconds { get; set; }

    public double MoveSeconds { get; set; }

    public int Planned => _planned;

    public int Probed => _probed;

    public int Reused => _reused;

    public int Failed => _failed;

    /// <summary>Moves made by <see cref="Join"/>.</summary>
    public int Joined => _joined;

    /// <summary>A checker of the calling thread (the scene of the whole tree).</summary>
    public CollisionChecker Checker => _checkers.Value!;

    public bool TryCached(TourNode from, TourNode to, [NotNullWhen(true)] out PlannedMove? move)
    {
        if (cache.TryGet(from.Key, to.Key, out var found))
        {
            lock (_seen)
            {
                if (_seen.Add((from.Key, to.Key)))
                {
                    _reused++;
                }
            }

            move = found;
            return true;
        }

        move = null;
        return false;
    }

    /// <summary>The move, planned now if it is not known yet (failures are remembered too).</summary>
    public PlannedMove Get(TourNode from, TourNode to) => Get(from.Key, from.Configuration, to.Key, to.Configuration);

    public PlannedMove Get(string fromKey, double[] from, string toKey, double[] to)
    {
        if (cache.TryGet(fromKey, toKey, out var cached))
        {
            return cached;
        }

        var seed = StableHash.Of(Settings.Seed, Cell.Scan.TreeId, StandKey, fromKey, toKey);
        var result = _planner.Plan(from, to, Checker, new DeterministicRandom(seed), Clock, CancellationToken);
        var move = result.Success
            ? new PlannedMove(true, result.Path, TimeOf(fromKey, toKey, result.Path).DurationS, result.Method)
            : new PlannedMove(false, [], double.MaxValue, result.Method);
        cache.Add(fromKey, toKey, move);
        Interlocked.Increment(ref _planned);
        if (!move.Success)
        {
            Interlocked.Increment(ref _failed);
        }

        return move;
    }

    /// <summary>
    /// The move from <paramref name="from"/> to <paramref name="to"/> made of the two found moves through
    /// <paramref name="via"/> (<see cref="MovePlanner.Join"/>); it takes the pair's place in the cache, a failed
    /// search included.
    /// </summary>
    public PlannedMove Join(TourNode from, TourNode via, TourNode to)
    {
        if (!cache.TryGet(from.Key, via.Key, out var first) || !first.Success || !cache.TryGet(via.Key, to.Key, out var second) || !second.Success)
        {
            throw new InvalidOperationException($"Joining {from.Key} → {to.Key} through {via.Key} needs both moves found first.");
        }

        var seed = StableHash.Of(Settings.Seed, Cell.Scan.TreeId, StandKey, from.Key, to.Key, "via:" + via.Key);
        var result = _planner.Join(first.Path, second.Path, new ArmMotionValidator(Checker), new DeterministicRandom(seed), Clock, CancellationToken);
        var move = new PlannedMove(true, result.Path, TimeOf(from.Key, to.Key, result.Path).DurationS, PlannerMethod.Via);
        cache.Add(from.Key, to.Key, move);
        Interlocked.Increment(ref _joined);
        return move;
    }

    /// <summary>The move's trajectory (blended through its corners, proven free); timed once per planning run.</summary>
    public TimedPath Timed(TourNode from, TourNode to, PlannedMove move) => TimeOf(from.Key, to.Key, move.Path);

    private TimedPath TimeOf(string fromKey, string toKey, IReadOnlyList<double[]> path) =>
        _timed.GetOrAdd((fromKey, toKey), _ => SmoothTiming.Time(path, Limits, Checker));

    /// <summary>Checks the straight line only; a free one goes into the cache as a planned (direct) move.</summary>
    public bool ProbeStraight(TourNode from, TourNode to)
    {
        if (cache.TryGet(from.Key, to.Key, out var cached))
        {
            return cached.Success && cached.Path.Count == 2;
        }

        if (cache.IsStraightBlocked(from.Key, to.Key))
        {
            return false;
        }

        Interlocked.Increment(ref _probed);
        if (!Checker.IsEdgeFree(from.Configuration, to.Configuration))
        {
            cache.MarkStraightBlocked(from.Key, to.Key);
            return false;
        }

        var path = new[] { from.Configuration, to.Configuration };
        cache.Add(from.Key, to.Key, new PlannedMove(true, path, TimeParameterizer.StraightLineSeconds(from.Configuration, to.Configuration, Limits), PlannerMethod.Direct));
        return true;
    }

    public void Dispose() => _checkers.Dispose();
}
