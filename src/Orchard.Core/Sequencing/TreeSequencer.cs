using System.Globalization;
using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Reachability;
using Orchard.Core.Stops;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Turns a tree scan into a timed cut schedule, and re-plans it after a missed cut. The steps, each in
/// a file of its own:
/// <list type="number">
/// <item><see cref="CutSelection"/>: which cuts to work on (eligible, not done or dropped) and what is said of the others.</item>
/// <item><see cref="StopSelection"/>: a few stops along the row (both sides) that together reach the most
/// cuts, each with its stowed arm clear; each cut goes to the first stop chosen that reaches it.</item>
/// <item><see cref="StopSequencer"/> and <see cref="LazyTourSearch"/>: per stop, the order of its cuts (a
/// generalised TSP over the candidates' clear poses, solved with OR-Tools on lazily evaluated
/// <see cref="ArcCostMatrix"/> costs; moves from the <see cref="MoveOracle"/>).</item>
/// <item><see cref="ScheduleBuilder"/>: per stop, the timed steps and the checked return to stow.</item>
/// <item>Cuts whose moves fail at their stop are given to another chosen stop that reaches them, or to a
/// new stop while the budget allows; what is left is listed with the stop that came nearest and what
/// stopped it.</item>
/// </list>
/// Deterministic for one seed: all randomness comes from streams named by the tree, the stand, and the
/// cut or the move's two ends.
/// </summary>
public static class TreeSequencer
{
    /// <summary>Rounds of giving failed cuts to other stops.</summary>
    private const int ReassignRounds = 3;

    public static (Schedule Schedule, TreePlanState State) Plan(TreeScan scan, ArmProfile arm, SequencingSettings settings, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(arm);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(clock);
        using var run = new Run(new WorkCell(scan, arm), settings, clock, cancellationToken);
        var request = new ReplanRequest(arm.StowConfiguration, [], [], null, RetryPolicy.Drop);
        var selection = CutSelection.Select(scan, arm, run.Topology, request, settings.Moot);
        var grid = StandGrid.Around(scan.ArmBase, settings.Stops);
        var hint = run.Survey(grid[0]);
        var problems = new List<TreeProblem>();

        var reachStart = clock.GetTimestamp();
        var chosen = StopSelection.Choose(grid, run.Survey, selection.Live, run.CutPoints, settings, settings.Stops.MaxStops, run.PastDeadline, cancellationToken);
        run.ReachSeconds += clock.GetElapsedTime(reachStart).TotalSeconds;
        if (!hint.StowClear(settings.Stops.StowClearanceM))
        {
            problems.Add(StowProblem(hint, chosen.Count > 0 ? chosen[0].Survey.Stand.ArmBase : null, settings));
        }

        var stops = chosen.Select(c => c.Survey).ToList();
        var assignment = new Dictionary<int, StandSurvey>();
        foreach (var (survey, covered) in chosen)
        {
            foreach (var c in covered)
            {
                assignment.TryAdd(c, survey);
            }
        }

        if (selection.Live.Count > 0 && stops.Count == 0)
        {
            problems.Add(NoStopProblem(run, grid, settings));
        }

        var schedule = run.Sequence(selection, stops, ExecutionOrder, assignment, start: null, grid, problems, version: 1);
        var state = new TreePlanState(schedule.Stops.Select(s => run.SurveyAt(s)).Distinct().Select(s => s.ToState()).ToArray());
        return (schedule, state);
    }

    /// <summary>
    /// A new schedule from where the arm is: a checked retreat first, then the cuts not yet done over the
    /// stops of the plan, the one the platform stands at first (then those after it, then those before),
    /// reusing every reachability result and move already planned there.
    /// </summary>
    public static (Schedule Schedule, TreePlanState State) Replan(TreeScan scan, ArmProfile arm, TreePlanState state, ReplanRequest request, int version, SequencingSettings settings, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(arm);
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(clock);

        // A re-plan must answer the waiting arm quickly: wider probing (cheap, mostly remembered), every move
        // not yet looked at probed after the first round (most are remembered; on 40-cut trees this took the
        // rounds from 5–12 to 3–5 and the re-plan median from 197 to 104 ms, schedules no longer), and the moves
        // as planned against the full tree (safe) without the slower current-scene improvement.
        var quick = settings with
        {
            ProbeNeighbours = Math.Max(settings.ProbeNeighbours, settings.ReplanProbeNeighbours),
            ReplanMovesAgainstCurrentScene = false,
            MaxPolishRounds = settings.ReplanPolishRounds,
            BlockedGuessFactor = settings.ReplanBlockedGuessFactor,
            ProbeAllAfterRounds = 1,
        };
        using var run = new Run(new WorkCell(scan, arm), quick, clock, cancellationToken);
        var known = state.Stands.Select(s => run.Adopt(s)).ToList();
        if (known.Count == 0)
        {
            known.Add(run.Survey(StandGrid.Around(scan.ArmBase, settings.Stops)[0]));
        }

        var here = request.ArmBase is { } at ? known.FirstOrDefault(s => SamePose(s.Stand.ArmBase, at)) ?? run.Survey(new Stand(StopSide.Near, at, 0, 0)) : known[0];
        var position = known.IndexOf(here);
        var stops = new List<StandSurvey> { here };
        stops.AddRange(known.Skip(position + 1));
        stops.AddRange(known.Take(Math.Max(0, position)));

        var selection = CutSelection.Select(scan, arm, run.Topology, request, settings.Moot);
        var approaches = here.Known.Values
            .OrderBy(r => selection.Missed == r.CutIndex ? 0 : 1).ThenBy(r => r.CutIndex)
            .SelectMany(r => r.Candidates.Select(c => (c, r.LimbGroup)));
        var start = StartRetreat.Assess(here.Cell, request.CurrentConfiguration, settings.Reachability, approaches);
        var problems = new List<TreeProblem>();
        if (!start.CanStart)
        {
            problems.Add(start.ToProblem());
            var stuck = new ScheduleStop(1, here.Stand.Side, here.Stand.ArmBase, here.Stand.AlongRowOffsetM, here.Stand.IntoAlleyOffsetM, 0, 0,
                request.CurrentConfiguration.ToArray(), 0, [], [], 0, "none", [], []);
            var left = selection.Unscheduled.Concat(selection.Live.Select(c => new UnscheduledCut(scan.Cuts[c].Id, UnscheduledStatus.NotPlanned, UnscheduledReason.PlanningStopped, "The arm cannot start where it is: " + start.Message, NearestStop: 1)))
                .OrderBy(u => u.CutId, StringComparer.Ordinal).ToArray();
            var nothing = new Schedule(scan.TreeId, version, string.Empty, null, arm.Id, ScheduleStatus.NothingScheduled, 0, 0, 0, [stuck], left, problems, run.Statistics(0, 0, 0, 0));
            return (nothing, state);
        }

        // Each cut goes to the first stop (in this order) that reaches it.
        var assignment = new Dictionary<int, StandSurvey>();
        foreach (var survey in stops)
        {
            var open = selection.Live.Where(c => !assignment.ContainsKey(c)).ToArray();
            survey.Analyse(open, quick, cancellationToken);
            foreach (var c in survey.Reaching(open))
            {
                assignment[c] = survey;
            }
        }

        var schedule = run.Sequence(selection, stops, s => s, assignment, start, grid: null, problems, version);
        var used = stops.Select(s => s.ToState()).ToArray();
        return (schedule, new TreePlanState(used));
    }

    /// <summary>Near-side stops along the row (increasing x), then far-side ones coming back (decreasing x): a serpentine pass.</summary>
    private static IReadOnlyList<StandSurvey> ExecutionOrder(IReadOnlyList<StandSurvey> stops) =>
        stops.Where(s => s.Stand.Side == StopSide.Near).OrderBy(s => s.Stand.ArmBase.PositionM.X)
            .Concat(stops.Where(s => s.Stand.Side == StopSide.Far).OrderByDescending(s => s.Stand.ArmBase.PositionM.X))
            .ToArray();

    private static bool SamePose(ArmBasePose a, ArmBasePose b) =>
        Math.Abs(a.PositionM.X - b.PositionM.X) < 1e-4 && Math.Abs(a.PositionM.Y - b.PositionM.Y) < 1e-4 && Math.Abs(a.PositionM.Z - b.PositionM.Z) < 1e-4
        && Math.Abs(Math.IEEERemainder(a.YawRad - b.YawRad, 2 * Math.PI)) < 1e-4;

    private static TreeProblem StowProblem(StandSurvey hint, ArmBasePose? suggested, SequencingSettings settings)
    {
        var r = hint.StowReport;
        var what = hint.StowContact;
        var state = r.ClearanceM < 0 ? "is in contact" : r.IsFree ? "has too little room" : "is within the safety margin";
        var message = string.Create(CultureInfo.InvariantCulture,
            $"At the tablet's stand the stowed arm {state}: {r.ClearanceM * 1000:F1} mm between the {what.ArmLink ?? "arm"} and {what.Touches ?? "the scene"} (at least {settings.Stops.StowClearanceM * 1000:F0} mm needed).")
            + (suggested is null ? " No stand nearby leaves the stowed arm clear." : " Stops were chosen elsewhere; the first is suggested.");
        return new TreeProblem("standStowNotClear", message, r.ClearanceM, what.ArmLink, what.Touches, suggested);
    }

    private static TreeProblem NoStopProblem(Run run, IReadOnlyList<Stand> grid, SequencingSettings settings)
    {
        var clear = grid.Select(run.Survey).Where(s => s.StowClear(settings.Stops.StowClearanceM)).ToList();
        if (clear.Count == 0)
        {
            var best = grid.Select(run.Survey).OrderByDescending(s => s.StowReport.ClearanceM).First();
            return new TreeProblem("noClearStand", string.Create(CultureInfo.InvariantCulture,
                $"No stand within {settings.Stops.AlongRowRangeM:F1} m along the row leaves the stowed arm clear; the best has {best.StowReport.ClearanceM * 1000:F1} mm between the {best.StowContact.ArmLink ?? "arm"} and {best.StowContact.Touches ?? "the scene"}. Hedge the tree or leave it to the hand crew."),
                best.StowReport.ClearanceM, best.StowContact.ArmLink, best.StowContact.Touches);
        }

        return new TreeProblem("noStopReaches", "No stand with the stowed arm clear reaches any of the cuts; they are left to the hand crew.");
    }

    /// <summary>The state of one planning call: surveys by stand, move oracles by stand, the clock and the statistics.</summary>
    private sealed class Run : IDisposable
    {
        private readonly Dictionary<string, StandSurvey> _surveys = new(StringComparer.Ordinal);
        private readonly Dictionary<string, MoveOracle> _oracles = new(StringComparer.Ordinal);
        private readonly long _began;
        private int _rounds;

        public Run(WorkCell cell, SequencingSettings settings, TimeProvider clock, CancellationToken cancellationToken)
        {
            Cell = cell;
            Settings = settings;
            Clock = clock;
            CancellationToken = cancellationToken;
            _began = clock.GetTimestamp();
            Topology = new BranchTopology(cell.Scan);
            Limits = Timing.JointSpeedLimits.From(cell.Profile);
            var scan = cell.Scan;
            var branchIndex = Topology.BranchIndex;
            CutIndexOf = Enumerable.Range(0, scan.Cuts.Count).ToDictionary(c => scan.Cuts[c].Id, StringComparer.Ordinal);
            CutPoints = Enumerable.Range(0, scan.Cuts.Count).ToDictionary(c => c, c => ReachabilityAnalyzer.CutPointAndAxis(scan, branchIndex[scan.Cuts[c].BranchId], scan.Cuts[c].PositionAlong).Point);
        }

        public WorkCell Cell { get; }

        public SequencingSettings Settings { get; }

        public TimeProvider Clock { get; }

        public CancellationToken CancellationToken { get; }

        public BranchTopology Topology { get; }

        public Timing.JointSpeedLimits Limits { get; }

        public IReadOnlyDictionary<int, Vec3> CutPoints { get; }

        public Dictionary<string, int> CutIndexOf { get; }

        public double ReachSeconds { get; set; }

        public bool PastDeadline() => Settings.Deadline is { } deadline && Clock.GetElapsedTime(_began) > deadline;

        public StandSurvey Survey(Stand stand)
        {
            if (!_surveys.TryGetValue(stand.Key, out var survey))
            {
                survey = new StandSurvey(Cell.AtStand(stand.ArmBase), stand);
                _surveys[stand.Key] = survey;
            }

            return survey;
        }

        public StandSurvey Adopt(StandState state)
        {
            var survey = new StandSurvey(Cell.AtStand(state.Stand.ArmBase), state.Stand, state.Moves, state.Reachability, state.Order);
            _surveys[state.Stand.Key] = survey;
            return survey;
        }

        public StandSurvey SurveyAt(ScheduleStop stop) =>
            _surveys.Values.First(s => s.Stand.Side == stop.Side && SamePose(s.Stand.ArmBase, stop.ArmBase));

        public MoveOracle Oracle(StandSurvey survey)
        {
            if (!_oracles.TryGetValue(survey.Stand.Key, out var oracle))
            {
                oracle = new MoveOracle(survey.Cell, survey.Stand.Key, survey.Moves, Settings, Limits, Clock, CancellationToken);
                _oracles[survey.Stand.Key] = oracle;
            }

            return oracle;
        }

        /// <summary>
        /// Orders and builds every stop; cuts whose moves fail at their stop go to another stop that
        /// reaches them (or, when planning a new scan, to a new stop); the rest is explained.
        /// </summary>
        public Schedule Sequence(
            CutSelection selection,
            List<StandSurvey> stops,
            Func<IReadOnlyList<StandSurvey>, IReadOnlyList<StandSurvey>> executionOrder,
            Dictionary<int, StandSurvey> assignment,
            StartAssessment? start,
            IReadOnlyList<Stand>? grid,
            List<TreeProblem> problems,
            int version)
        {
            var scan = Cell.Scan;
            var tried = new Dictionary<int, HashSet<string>>();
            var orders = new Dictionary<string, (string Signature, StopOrder Order)>(StringComparer.Ordinal);
            List<(StandSurvey Survey, StopBuild Build)> built = [];
            var failed = new List<int>();
            for (var round = 0; round < ReassignRounds; round++)
            {
                var ordered = executionOrder(stops);
                built = Build(selection, ordered, assignment, start, orders);
                failed = built.SelectMany(b => b.Build.Failed).Distinct().Order().ToList();
                if (failed.Count == 0 || PastDeadline())
                {
                    break;
                }

                var changed = false;
                var homeless = new List<int>();
                foreach (var c in failed)
                {
                    var was = assignment[c];
                    (tried.TryGetValue(c, out var set) ? set : tried[c] = new HashSet<string>(StringComparer.Ordinal)).Add(was.Stand.Key);
                    var other = ordered.FirstOrDefault(s => !tried[c].Contains(s.Stand.Key) && Reaches(s, c));
                    if (other is not null)
                    {
                        assignment[c] = other;
                        changed = true;
                    }
                    else
                    {
                        homeless.Add(c);
                    }
                }

                if (grid is not null && homeless.Count > 0 && stops.Count < Settings.Stops.MaxStops)
                {
                    var taken = stops.Select(s => s.Stand.Key).ToHashSet(StringComparer.Ordinal);
                    var reachStart = Clock.GetTimestamp();
                    var more = StopSelection.Choose(grid.Where(g => !taken.Contains(g.Key)).ToArray(), Survey, homeless, CutPoints, Settings, Settings.Stops.MaxStops - stops.Count, PastDeadline, CancellationToken);
                    ReachSeconds += Clock.GetElapsedTime(reachStart).TotalSeconds;
                    foreach (var (survey, covered) in more)
                    {
                        stops.Add(survey);
                        foreach (var c in covered)
                        {
                            assignment[c] = survey;
                            changed = true;
                        }
                    }
                }

                if (!changed)
                {
                    break;
                }
            }

            // The stops that make cuts, numbered in order; the platform's moves between them.
            var kept = built.Where((b, i) => b.Build.Stop.Steps.Count > 0 || (i == 0 && start is not null)).ToList();
            var scheduledStops = new List<ScheduleStop>();
            var clock = 0.0;
            var sequence = 1;
            ScheduleStop? previous = null;
            foreach (var (_, build) in kept)
            {
                var stop = build.Stop;
                var move = previous is not null && previous.Side == stop.Side ? PlatformMoveSeconds(previous.ArmBase, stop.ArmBase) : 0;
                var shift = clock + move - stop.StartSecond;
                var renumbered = Shift(stop, scheduledStops.Count + 1, move, shift, sequence);
                scheduledStops.Add(renumbered);
                sequence += stop.Steps.Count;
                clock = renumbered.EndSecond;
                previous = renumbered;
                if (!build.ReturnedToStow)
                {
                    problems.Add(new TreeProblem("noReturnToStow", $"No collision-free move back to stow was found at stop {renumbered.Sequence}, even from where it started; the arm must be brought back under supervision."));
                }
            }

            var scheduled = scheduledStops.SelectMany(s => s.Steps).Select(s => s.CutId).ToHashSet(StringComparer.Ordinal);
            var unscheduled = new List<UnscheduledCut>(selection.Unscheduled);
            var deadlineHit = PastDeadline();
            foreach (var c in selection.Live.Where(c => !scheduled.Contains(scan.Cuts[c].Id)))
            {
                unscheduled.Add(deadlineHit && !failed.Contains(c) && assignment.ContainsKey(c)
                    ? new UnscheduledCut(scan.Cuts[c].Id, UnscheduledStatus.NotPlanned, UnscheduledReason.PlanningStopped, "Planning reached its deadline before this cut was scheduled.")
                    : Explain(c, stops, scheduledStops, failed.Contains(c)));
            }

            if (deadlineHit)
            {
                problems.Add(new TreeProblem("planningDeadline", string.Create(CultureInfo.InvariantCulture,
                    $"Planning stopped at its deadline ({Settings.Deadline!.Value.TotalSeconds:F0} s); the schedule holds what was planned by then.")));
            }

            var steps = scheduledStops.Sum(s => s.Steps.Count);
            var status = deadlineHit && unscheduled.Any(u => u.Status == UnscheduledStatus.NotPlanned) ? ScheduleStatus.Partial
                : steps == 0 && selection.Live.Count > 0 ? ScheduleStatus.NothingScheduled
                : ScheduleStatus.Complete;
            var platform = scheduledStops.Sum(s => s.PlatformMoveSeconds);
            var total = scheduledStops.Count == 0 ? 0 : scheduledStops[^1].EndSecond;
            var nodes = _oracles.Count == 0 ? 0 : orders.Values.Sum(o => o.Order.Nodes.Count - 1);
            var allPairs = orders.Values.Sum(o => AllPairsCount(o.Order.Nodes));
            return new Schedule(scan.TreeId, version, string.Empty, null, Cell.Profile.Id, status, total, total - platform, platform, scheduledStops,
                unscheduled.OrderBy(u => u.CutId, StringComparer.Ordinal).ToArray(), problems, Statistics(nodes, allPairs, _rounds, _surveys.Values.Count(s => s.Known.Count > 0)));
        }

        public ScheduleStatistics Statistics(int nodes, int allPairs, int rounds, int standsAnalysed) => new(
            nodes, _oracles.Values.Sum(o => o.Planned), _oracles.Values.Sum(o => o.Probed), _oracles.Values.Sum(o => o.Reused), allPairs, _oracles.Values.Sum(o => o.Failed), rounds,
            Clock.GetElapsedTime(_began).TotalSeconds, ReachSeconds, _oracles.Values.Sum(o => o.SolverSeconds), _oracles.Values.Sum(o => o.MoveSeconds),
            Settings.Mode == EvaluationMode.Lazy ? "lazy" : "allPairs", standsAnalysed);

        public void Dispose()
        {
            foreach (var oracle in _oracles.Values)
            {
                oracle.Dispose();
            }
        }

        private bool Reaches(StandSurvey survey, int cut)
        {
            survey.Analyse([cut], Settings, CancellationToken);
            return survey.Reach(cut).IsReachable;
        }

        /// <summary>Orders (reusing an order whose stop, start and cuts did not change) and builds every stop in execution order.</summary>
        private List<(StandSurvey, StopBuild)> Build(CutSelection selection, IReadOnlyList<StandSurvey> ordered, Dictionary<int, StandSurvey> assignment, StartAssessment? start, Dictionary<string, (string Signature, StopOrder Order)> orders)
        {
            var wood = new FallingWood(Cell.Scan, Topology);
            foreach (var c in selection.Done.Order())
            {
                wood.Add(c);
            }

            var builds = new List<(StandSurvey, StopBuild)>();
            var clock = 0.0;
            var sequence = 1;
            for (var i = 0; i < ordered.Count; i++)
            {
                var survey = ordered[i];
                var cuts = assignment.Where(p => p.Value == survey).Select(p => p.Key).Order().ToArray();
                var first = i == 0 && start is not null;
                var startNode = StopSequencer.StartNode(first ? start!.ClearConfiguration : Cell.Profile.StowConfiguration.ToArray(), stowed: !first);
                var oracle = Oracle(survey);
                var signature = startNode.Key + "|" + string.Join(',', cuts);
                if (!orders.TryGetValue(survey.Stand.Key, out var known) || known.Signature != signature)
                {
                    var retried = selection.Missed is { } m && cuts.Contains(m) ? m : (int?)null;
                    var order = PastDeadline() ? new StopOrder([startNode], [0], 0) : StopSequencer.Order(survey, cuts, startNode, retried, selection.Policy, selection.Precedences, oracle, PastDeadline, CancellationToken);
                    _rounds += order.Rounds;
                    orders[survey.Stand.Key] = (signature, order);
                }

                var build = ScheduleBuilder.Build(survey, orders[survey.Stand.Key].Order, oracle, i + 1, 0, clock, sequence, first ? start : null, wood, CancellationToken);
                survey.LastOrder = build.Stop.Steps.Select(x => $"c{CutIndexOf[x.CutId]}/{x.CandidateIndex}").ToArray();
                builds.Add((survey, build));
                clock = build.Stop.EndSecond;
                sequence += build.Stop.Steps.Count;
            }

            return builds;
        }

        private double PlatformMoveSeconds(ArmBasePose from, ArmBasePose to)
        {
            var dx = to.PositionM.X - from.PositionM.X;
            var dy = to.PositionM.Y - from.PositionM.Y;
            var stops = Settings.Stops;
            return (Math.Sqrt((dx * dx) + (dy * dy)) / stops.PlatformSpeedMS) + stops.SettleSeconds;
        }

        /// <summary>The stop renumbered and moved in time by <paramref name="shift"/> seconds, with its platform move.</summary>
        private static ScheduleStop Shift(ScheduleStop stop, int stopSequence, double platformMoveSeconds, double shift, int firstStep) => stop with
        {
            Sequence = stopSequence,
            PlatformMoveSeconds = platformMoveSeconds,
            StartSecond = stop.StartSecond + shift,
            Steps = stop.Steps.Select((s, k) => s with { Sequence = firstStep + k, StartSecond = s.StartSecond + shift }).ToArray(),
        };

        /// <summary>Why a cut the machine should make is not in the schedule, from the stop that came nearest.</summary>
        private UnscheduledCut Explain(int cut, List<StandSurvey> stops, IReadOnlyList<ScheduleStop> scheduled, bool moveFailed)
        {
            var id = Cell.Scan.Cuts[cut].Id;

            // The stops the schedule makes, when there are any; else every stand tried, else the tablet's.
            var made = stops.Where(s => scheduled.Any(st => st.Side == s.Stand.Side && SamePose(st.ArmBase, s.Stand.ArmBase))).ToList();
            List<StandSurvey> candidates = made.Count > 0 ? made : stops.Count > 0 ? stops : [Survey(StandGrid.Place(Cell.Scan.ArmBase, StopSide.Near, 0, 0))];
            foreach (var s in candidates)
            {
                s.Analyse([cut], Settings, CancellationToken);
            }

            int? NumberOf(StandSurvey s) => scheduled.FirstOrDefault(st => st.Side == s.Stand.Side && SamePose(st.ArmBase, s.Stand.ArmBase))?.Sequence;
            string Where(StandSurvey s) => NumberOf(s) is { } k ? $"stop {k}" : $"the {(s.Stand.Side == StopSide.Near ? "near" : "far")} stand {s.Stand.AlongRowOffsetM:+0.0;-0.0;0.0} m along the row";
            var reachable = candidates.FirstOrDefault(s => s.Reach(cut).IsReachable);
            if (reachable is not null || moveFailed)
            {
                var at = reachable ?? candidates[0];
                var blocked = BlockedWayFromStow(at, cut);
                return new UnscheduledCut(id, UnscheduledStatus.Unreachable, UnscheduledReason.NoMove,
                    $"The shear can be put to it from {Where(at)}, but no collision-free move to its approach was found within the planning budget"
                        + (blocked is null ? "." : $"; the straight way there is blocked: {blocked}."),
                    NearestStop: NumberOf(at), BlockedBy: blocked);
            }

            // Nearest: joint limits or collision (the shear got there) before out of reach; then the smallest shortfall.
            var best = candidates.Select(s => (Survey: s, Reach: s.Reach(cut)))
                .OrderBy(p => p.Reach.Reason switch { UnreachableReason.JointLimits => 0, UnreachableReason.Collision => 1, UnreachableReason.OutOfReach => 2, _ => 3 })
                .ThenBy(p => p.Reach.ShortfallM ?? 0)
                .First();
            var reason = best.Reach.Reason switch
            {
                UnreachableReason.AboveShearRating => UnscheduledReason.AboveShearRating,
                UnreachableReason.OutOfReach => UnscheduledReason.OutOfReach,
                UnreachableReason.JointLimits => UnscheduledReason.JointLimits,
                _ => UnscheduledReason.Collision,
            };
            var shortfall = best.Reach.ShortfallM is { } m ? Math.Round(m * 1000, 1) : (double?)null;
            return new UnscheduledCut(id, UnscheduledStatus.Unreachable, reason, $"From {Where(best.Survey)}: {best.Reach.Detail}",
                NearestStop: NumberOf(best.Survey), ShortfallMm: shortfall, BlockedBy: best.Reach.BlockedBy);
        }

        /// <summary>What the straight joint-space line from stow to the cut's first candidate's clear pose first touches, in words.</summary>
        private static string? BlockedWayFromStow(StandSurvey survey, int cut)
        {
            var reach = survey.Reach(cut);
            if (!reach.IsReachable)
            {
                return null;
            }

            var checker = survey.Cell.CreateChecker();
            var path = new[] { survey.Cell.Profile.StowConfiguration.ToArray(), reach.Candidates[0].ClearConfiguration.ToArray() };
            foreach (var q in PathSampling.Samples(path, survey.Cell.Arm, 0.01))
            {
                if (!checker.IsFree(q))
                {
                    var report = checker.Check(q);
                    var what = ContactDescription.Of(survey.Cell, report);
                    return $"the {what.ArmLink ?? "arm"} would touch {what.Touches ?? "something"}";
                }
            }

            return null;
        }

        private static int AllPairsCount(IReadOnlyList<TourNode> nodes)
        {
            var count = 0;
            for (var i = 0; i < nodes.Count; i++)
            {
                for (var j = 1; j < nodes.Count; j++)
                {
                    if (i != j && nodes[i].CutIndex != nodes[j].CutIndex)
                    {
                        count++;
                    }
                }
            }

            return count;
        }
    }
}
