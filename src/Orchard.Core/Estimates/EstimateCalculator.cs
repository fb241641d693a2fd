namespace Orchard.Core.Estimates;

/// <summary>
/// Robot time for rows, blocks and the orchard from the trees planned so far.
/// <list type="bullet">
/// <item>Arm time: planned trees count their schedule seconds; the others are predicted by a
/// <see cref="TreeTimeModel"/> fitted on the planned trees. Trees the layout counts beyond the records
/// (unscanned) are predicted at the mean scan cuts and branch length of all scanned trees; the
/// uncertainty of that mean is not in the interval.</item>
/// <item>The interval of a row, block or orchard is computed over all its predicted trees at once with
/// <see cref="TreeTimeModel.PredictTotal"/> (not by combining row half-widths), so the shared
/// coefficient error is counted once per group and the new-tree errors are taken as independent.</item>
/// <item>Platform moves per row with N trees: the pass down the near alley, (N − 1)·in-row spacing / speed +
/// N·settle seconds (the first stop at each tree; moves between one tree's own stops are in its schedule).
/// A row worked from both sides whose trees have far-side stops adds the pass down the next alley:
/// (N − 1)·spacing / speed + F·settle seconds, F the trees with far-side stops (planned trees as planned; the
/// others at the planned trees' share).</item>
/// <item>Hand follow-up: the cuts planned trees leave for a person, plus the others' scan cuts at the planned
/// trees' share of such cuts, × <see cref="EstimateSettings.HandSecondsPerCut"/>.</item>
/// <item>Measured cut times: in a block whose <see cref="CutTimeFit"/> is <see cref="CutTimeSource.Measured"/>, a
/// planned tree counts its schedule seconds with the planned cut seconds replaced by the measured line's,
/// seconds − planned cut seconds + n·a + b·Σd; the tree-time model is then fitted on these seconds, so trees
/// not yet planned learn from them too.</item>
/// </list>
/// Rows appear in the order of <c>rows</c>; blocks in the order of their first row.
/// </summary>
public static class EstimateCalculator
{
    public static OrchardEstimate Compute(
        IReadOnlyList<TreeRecord> trees, IReadOnlyList<RowLayout> rows, EstimateSettings settings, IReadOnlyDictionary<string, CutTimeFit>? cutTimes = null)
    {
        ArgumentNullException.ThrowIfNull(trees);
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(settings);
        Validate(settings);
        if (cutTimes is not null)
        {
            trees = trees.Select(t => WithMeasuredCutTimes(t, cutTimes)).ToArray();
        }

        var layouts = new Dictionary<(string Block, string Row), RowLayout>();
        foreach (var row in rows)
        {
            ArgumentNullException.ThrowIfNull(row);
            if (!(row.InRowSpacingM >= 0 && row.RowSpacingM >= 0 && row.RowLengthM >= 0)
                || !double.IsFinite(row.InRowSpacingM + row.RowSpacingM + row.RowLengthM)
                || row.TreesInRow is < 0)
            {
                throw new ArgumentException($"Row {row.BlockId}/{row.RowId}: spacings, length and tree count must be finite and not negative.", nameof(rows));
            }

            if (!layouts.TryAdd((row.BlockId, row.RowId), row))
            {
                throw new ArgumentException($"Row {row.BlockId}/{row.RowId} appears twice in the layout.", nameof(rows));
            }
        }

        var treesByRow = new Dictionary<(string Block, string Row), List<TreeRecord>>();
        foreach (var tree in trees)
        {
            ArgumentNullException.ThrowIfNull(tree);
            var key = (tree.BlockId, tree.RowId);
            if (!layouts.ContainsKey(key))
            {
                throw new ArgumentException($"Tree {tree.TreeId} stands in row {tree.BlockId}/{tree.RowId}, which has no layout.", nameof(trees));
            }

            if (!treesByRow.TryGetValue(key, out var list))
            {
                list = [];
                treesByRow.Add(key, list);
            }

            list.Add(tree);
        }

        var model = TreeTimeModel.Fit(trees, settings);
        var meanTree = trees.Count == 0
            ? new TreeFeatures(0, 0)
            : new TreeFeatures(trees.Average(t => (double)t.ScanCutCount), trees.Average(t => t.TotalBranchLengthM));
        var plannedScan = trees.Where(IsPlanned).Sum(t => (double)t.ScanCutCount);
        var scheduledFraction = plannedScan > 0 ? trees.Where(IsPlanned).Sum(t => (double)t.ScheduledCuts) / plannedScan : 1.0;
        var handFraction = plannedScan > 0 ? trees.Where(IsPlanned).Sum(t => (double)t.HandCuts) / plannedScan : 0.0;
        var plannedCount = trees.Count(IsPlanned);
        var farFraction = plannedCount > 0 ? trees.Where(IsPlanned).Count(t => t.FarSideStops > 0) / (double)plannedCount : 0.0;
        var shares = new Shares(meanTree, scheduledFraction, handFraction, farFraction);

        var blocks = new List<BlockEstimate>();
        var blockOrder = new List<string>();
        var rowsByBlock = new Dictionary<string, List<(RowLayout Layout, Tally Tally)>>();
        foreach (var row in rows)
        {
            var tally = new Tally();
            tally.AddRow(row, treesByRow.GetValueOrDefault((row.BlockId, row.RowId)) ?? [], shares, settings);
            if (!rowsByBlock.TryGetValue(row.BlockId, out var blockRows))
            {
                blockRows = [];
                rowsByBlock.Add(row.BlockId, blockRows);
                blockOrder.Add(row.BlockId);
            }

            blockRows.Add((row, tally));
        }

        var orchard = new Tally();
        foreach (var blockId in blockOrder)
        {
            var block = new Tally();
            var rowEstimates = new List<RowEstimate>();
            foreach (var (layout, tally) in rowsByBlock[blockId])
            {
                rowEstimates.Add(new RowEstimate(layout.BlockId, layout.RowId, layout, tally.Totals(model)));
                block.Add(tally);
            }

            orchard.Add(block);
            blocks.Add(new BlockEstimate(blockId, rowEstimates, block.Totals(model)));
        }

        return new OrchardEstimate(blocks, orchard.Totals(model), model, settings);
    }

    /// <summary>A planned tree's seconds with its planned cut seconds replaced by its block's measured line, when there is one.</summary>
    public static TreeRecord WithMeasuredCutTimes(TreeRecord tree, IReadOnlyDictionary<string, CutTimeFit> cutTimes)
    {
        ArgumentNullException.ThrowIfNull(tree);
        ArgumentNullException.ThrowIfNull(cutTimes);
        if (!IsPlanned(tree) || !cutTimes.TryGetValue(tree.BlockId, out var fit) || fit.Source != CutTimeSource.Measured)
        {
            return tree;
        }

        var measured = fit.SecondsForCuts(tree.ScheduledCuts, tree.CutDiameterSumMm);
        return tree with { ScheduleSeconds = Math.Max(0.0, tree.ScheduleSeconds!.Value - tree.PlannedCutSeconds + measured) };
    }

    private static bool IsPlanned(TreeRecord tree) =>
        tree.IsPlanned && tree.ScheduleSeconds is { } s && double.IsFinite(s) && s >= 0;

    private static void Validate(EstimateSettings settings)
    {
        if (!(settings.PlatformSpeedKmh > 0) || !double.IsFinite(settings.PlatformSpeedKmh))
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "PlatformSpeedKmh must be positive and finite.");
        }

        if (!(settings.SettleSecondsPerStop >= 0) || !double.IsFinite(settings.SettleSecondsPerStop))
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "SettleSecondsPerStop must be finite and not negative.");
        }

        if (!(settings.ManualSecondsPerTree >= 0) || !double.IsFinite(settings.ManualSecondsPerTree))
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "ManualSecondsPerTree must be finite and not negative.");
        }

        if (!(settings.HandSecondsPerCut >= 0) || !double.IsFinite(settings.HandSecondsPerCut))
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "HandSecondsPerCut must be finite and not negative.");
        }
    }

    /// <summary>What the planned trees say of the others: the mean scanned tree and the shares of scan cuts scheduled and left for hands, and of trees with far-side stops.</summary>
    private sealed record Shares(TreeFeatures MeanTree, double ScheduledFraction, double HandFraction, double FarFraction);

    /// <summary>Running sums of one row, block or the orchard.</summary>
    private sealed class Tally
    {
        private readonly List<TreeFeatures> _predicted = [];
        private int _rows, _planned, _notPlanned, _unscanned, _plannedCuts, _unreachable, _moot, _passes;
        private double _plannedSeconds, _predictedCuts, _moveSeconds, _areaM2, _manualSeconds, _handCuts, _handSeconds;

        public void AddRow(RowLayout row, List<TreeRecord> trees, Shares shares, EstimateSettings settings)
        {
            _rows++;
            var rowHandCuts = 0.0;
            var farTrees = 0.0;
            foreach (var tree in trees)
            {
                if (IsPlanned(tree))
                {
                    _planned++;
                    _plannedSeconds += tree.ScheduleSeconds!.Value;
                    _plannedCuts += tree.ScheduledCuts;
                    _unreachable += tree.UnreachableCuts;
                    _moot += tree.MootCuts;
                    rowHandCuts += tree.HandCuts;
                    farTrees += tree.FarSideStops > 0 ? 1 : 0;
                }
                else
                {
                    _notPlanned++;
                    _predicted.Add(TreeFeatures.Of(tree));
                    _predictedCuts += tree.ScanCutCount * shares.ScheduledFraction;
                    rowHandCuts += tree.ScanCutCount * shares.HandFraction;
                    farTrees += shares.FarFraction;
                }
            }

            var treeCount = Math.Max(trees.Count, row.TreesInRow ?? 0);
            var unscanned = treeCount - trees.Count;
            for (var i = 0; i < unscanned; i++)
            {
                _predicted.Add(shares.MeanTree);
                _predictedCuts += shares.MeanTree.ScanCuts * shares.ScheduledFraction;
                rowHandCuts += shares.MeanTree.ScanCuts * shares.HandFraction;
                farTrees += shares.FarFraction;
            }

            _unscanned += unscanned;
            _passes++;
            if (treeCount > 0)
            {
                var alleySeconds = (treeCount - 1) * row.InRowSpacingM / settings.PlatformSpeedMPerSecond;
                _moveSeconds += alleySeconds + (treeCount * settings.SettleSecondsPerStop);
                if (row.BothSides && farTrees > 0)
                {
                    _passes++;
                    _moveSeconds += alleySeconds + (farTrees * settings.SettleSecondsPerStop);
                }
            }

            _areaM2 += row.RowLengthM * row.RowSpacingM;
            _manualSeconds += treeCount * settings.ManualSecondsPerTree;
            _handCuts += rowHandCuts;
            _handSeconds += rowHandCuts * settings.HandSecondsPerCut;
        }

        public void Add(Tally other)
        {
            _predicted.AddRange(other._predicted);
            _rows += other._rows;
            _planned += other._planned;
            _notPlanned += other._notPlanned;
            _unscanned += other._unscanned;
            _plannedCuts += other._plannedCuts;
            _unreachable += other._unreachable;
            _moot += other._moot;
            _plannedSeconds += other._plannedSeconds;
            _predictedCuts += other._predictedCuts;
            _moveSeconds += other._moveSeconds;
            _areaM2 += other._areaM2;
            _manualSeconds += other._manualSeconds;
            _handCuts += other._handCuts;
            _handSeconds += other._handSeconds;
            _passes += other._passes;
        }

        public EstimateTotals Totals(TreeTimeModel model) => new(
            _rows,
            _planned + _notPlanned + _unscanned,
            _planned,
            _notPlanned,
            _unscanned,
            _plannedSeconds,
            _plannedCuts,
            _unreachable,
            _moot,
            _predictedCuts,
            model.PredictTotal(_predicted),
            _moveSeconds,
            _areaM2 / SquareMetresPerHectare,
            _manualSeconds / EstimateTotals.SecondsPerHour,
            _handCuts,
            _handSeconds / EstimateTotals.SecondsPerHour,
            _passes);
    }

    private const double SquareMetresPerHectare = 10_000.0;
}
