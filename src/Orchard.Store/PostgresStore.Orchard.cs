using Orchard.Core.Estimates;

namespace Orchard.Store;

/// <summary>The PostgreSQL store's orchard documents, tree features, progress tallies and cut durations.</summary>
public sealed partial class PostgresStore
{
    public Task<string?> GetOrchardDocumentAsync(string name, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT document_json FROM orchard_documents WHERE name = @name", cancellationToken, ("name", name));

    public async Task PutOrchardDocumentAsync(string name, string json, string? actorKeyId, CancellationToken cancellationToken)
    {
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO orchard_documents (name, document_json, updated_at) VALUES (@name, @json, now())
                ON CONFLICT (name) DO UPDATE SET document_json = excluded.document_json, updated_at = excluded.updated_at
                """, ct, ("name", name), ("json", json)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(actorKeyId, "orchardDocument.put", name), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken).ConfigureAwait(false);
    }

    public async Task<bool> PutScanFeaturesAsync(string treeId, string scanId, ScanFeatures features, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(features);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            INSERT INTO tree_features (tree_id, scan_id, scan_cut_count, branch_length_m, node_count, updated_at)
            SELECT @tree, @scan, @cuts, @length, @nodes, now()
            WHERE EXISTS (SELECT 1 FROM trees WHERE tree_id = @tree AND latest_scan_id = @scan)
            ON CONFLICT (tree_id) DO UPDATE SET scan_id = excluded.scan_id, scan_cut_count = excluded.scan_cut_count,
                branch_length_m = excluded.branch_length_m, node_count = excluded.node_count, updated_at = excluded.updated_at
            """, cancellationToken, ("tree", treeId), ("scan", scanId), ("cuts", features.CutCount), ("length", features.BranchLengthM),
            ("nodes", features.NodeCount)).ConfigureAwait(false) == 1;
    }

    public async Task<bool> PutScheduleFeaturesAsync(string treeId, int version, ScheduleFeatures features, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(features);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            INSERT INTO tree_features (tree_id, schedule_version, total_seconds, scheduled_cuts, unreachable_cuts, moot_cuts, hand_cuts,
                far_side_stops, cut_seconds, diameter_sum_mm, diameter_square_sum_mm2, updated_at)
            SELECT @tree, @version, @total, @steps, @unreachable, @moot, @hand, @far, @cut, @dsum, @dsq, now()
            WHERE EXISTS (SELECT 1 FROM trees WHERE tree_id = @tree AND current_version = @version)
            ON CONFLICT (tree_id) DO UPDATE SET schedule_version = excluded.schedule_version, total_seconds = excluded.total_seconds,
                scheduled_cuts = excluded.scheduled_cuts, unreachable_cuts = excluded.unreachable_cuts, moot_cuts = excluded.moot_cuts,
                hand_cuts = excluded.hand_cuts, far_side_stops = excluded.far_side_stops, cut_seconds = excluded.cut_seconds,
                diameter_sum_mm = excluded.diameter_sum_mm, diameter_square_sum_mm2 = excluded.diameter_square_sum_mm2, updated_at = excluded.updated_at
            """, cancellationToken, ("tree", treeId), ("version", version), ("total", features.TotalSeconds), ("steps", features.ScheduledCuts),
            ("unreachable", features.UnreachableCuts), ("moot", features.MootCuts), ("hand", features.HandCuts), ("far", features.FarSideStops),
            ("cut", features.CutSeconds), ("dsum", features.DiameterSumMm), ("dsq", features.DiameterSquareSumMm2)).ConfigureAwait(false) == 1;
    }

    public Task<IReadOnlyList<TreeFeaturesRecord>> ListTreeFeaturesAsync(CancellationToken cancellationToken) =>
        QueryAsync(OrchardRows.FeaturesSelect, OrchardRows.ReadFeatures, cancellationToken);

    public async Task<IReadOnlyList<OutcomeTally>> ListOutcomeTalliesAsync(CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        var outcomes = await QueryAsync(connection, null, OrchardRows.OutcomeCountsSelect, r => (r.GetString(0), r.GetString(1), (int)r.GetInt64(2)), cancellationToken).ConfigureAwait(false);
        var replans = await QueryAsync(connection, null, OrchardRows.ReplanCountsSelect, r => (r.GetString(0), (int)r.GetInt64(1)), cancellationToken).ConfigureAwait(false);
        return OrchardRows.Tallies(outcomes, replans);
    }

    public async Task<bool> AddCutDurationAsync(CutDurationRecord duration, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(duration);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            INSERT INTO cut_durations (tree_id, version, cut_id, block, diameter_mm, duration_seconds, reported_at)
            VALUES (@tree, @version, @cut, @block, @d, @seconds, now())
            ON CONFLICT (tree_id, version, cut_id) DO NOTHING
            """, cancellationToken, ("tree", duration.TreeId), ("version", duration.Version), ("cut", duration.CutId), ("block", duration.Block),
            ("d", duration.DiameterMm), ("seconds", duration.DurationSeconds)).ConfigureAwait(false) == 1;
    }

    public Task<IReadOnlyList<CutDurationRecord>> ListCutDurationsAsync(CancellationToken cancellationToken) =>
        QueryAsync(
            "SELECT tree_id, block, version, cut_id, diameter_mm, duration_seconds, reported_at FROM cut_durations ORDER BY reported_at, tree_id, version, cut_id",
            r => new CutDurationRecord(r.GetString(0), r.GetString(1), r.GetInt32(2), r.GetString(3), r.GetDouble(4), r.GetDouble(5), r.GetFieldValue<DateTimeOffset>(6)),
            cancellationToken);
}
