using System.Security.Claims;
using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Serialization;
using Orchard.Service.Auth;
using Orchard.Service.Workers;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>
/// Trees: the manager's listing, the controller's current schedule (ETag = version, If-None-Match → 304)
/// and cut outcomes (a stale version → 409 with the current one; <c>missed</c> starts a re-plan).
/// </summary>
public static class TreesApi
{
    public static RouteGroupBuilder MapTrees(this RouteGroupBuilder api)
    {
        api.MapGet("/trees", ListTrees).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin)).WithSummary("Every tree with its latest plan's totals.");
        api.MapGet("/trees/{treeId}/schedule", GetSchedule).RequireAuthorization(p => p.RequireRole(Roles.Controller, Roles.Manager, Roles.Admin))
            .WithSummary("The tree's current schedule; ETag is its version.");
        api.MapGet("/trees/{treeId}/scan", GetScan).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("The tree's latest scan, for drawing it.");
        api.MapPost("/trees/{treeId}/outcomes", PostOutcome).RequireAuthorization(p => p.RequireRole(Roles.Controller, Roles.Admin))
            .WithSummary("Report a cut's outcome against a schedule version.")
            .Accepts<OutcomeReport>("application/json");
        return api;
    }

    internal static async Task<Ok<TreeSummary[]>> ListTrees(IOrchardStore store, CancellationToken cancellationToken)
    {
        var trees = await store.ListTreesAsync(cancellationToken);
        return TypedResults.Ok(trees.OrderBy(t => t.Block, StringComparer.Ordinal).ThenBy(t => t.Row, StringComparer.Ordinal).ThenBy(t => t.PositionInRow)
            .Select(t => new TreeSummary(t.TreeId, t.Block, t.Row, t.PositionInRow, t.CurrentVersion, t.TotalSeconds, t.StepCount, t.UnscheduledCount, t.ArmProfileId)).ToArray());
    }

    internal static async Task<IResult> GetScan(string treeId, IOrchardStore store, CancellationToken cancellationToken)
    {
        var tree = await store.GetTreeAsync(treeId, cancellationToken);
        var scan = tree is null ? null : await store.GetScanAsync(tree.LatestScanId, cancellationToken);
        return scan is null ? Problems.Of(404, "No such tree", $"No tree '{treeId}'.") : TypedResults.Text(scan, "application/json");
    }

    internal static async Task<IResult> GetSchedule(string treeId, HttpRequest request, HttpResponse response, IOrchardStore store, ScheduleBodyCache bodies, CancellationToken cancellationToken)
    {
        // The tree's row says which version is current; the body comes from the cache when it holds that
        // version (versions never change once written), else from the store.
        var tree = await store.GetTreeAsync(treeId, cancellationToken);
        if (tree is null)
        {
            return Problems.Of(404, "No such tree", $"No tree '{treeId}'.");
        }

        var body = tree.CurrentVersion is { } current ? bodies.Find(treeId, current) : null;
        var version = tree.CurrentVersion ?? 0;
        if (body is null)
        {
            var schedule = await store.GetCurrentScheduleAsync(treeId, cancellationToken);
            if (schedule is null)
            {
                return Problems.Of(404, "Not planned yet", $"Tree '{treeId}' has no schedule yet; watch its plan job.");
            }

            version = schedule.Version;
            body = bodies.Keep(treeId, schedule.Version, schedule.ScheduleJson);
        }

        var etag = $"\"v{version}\"";
        response.Headers.ETag = etag;
        if (request.Headers.IfNoneMatch.Any(v => v is not null && v.Split(',').Any(t => t.Trim() == etag || t.Trim() == "*")))
        {
            return TypedResults.StatusCode(StatusCodes.Status304NotModified);
        }

        return TypedResults.Bytes(body, "application/json");
    }

    internal static async Task<IResult> PostOutcome(string treeId, HttpRequest request, ClaimsPrincipal user, IOrchardStore store, JobSignal signal, CancellationToken cancellationToken)
    {
        using var reader = new StreamReader(request.Body);
        var body = await reader.ReadToEndAsync(cancellationToken);
        var scope = user.FindFirstValue(ClaimTypes.NameIdentifier) ?? "anonymous";
        var key = IdempotencyKeys.From(request);
        if (key == string.Empty)
        {
            return Problems.Of(400, "Bad Idempotency-Key", $"The Idempotency-Key header must be one non-blank value of at most {IdempotencyKeys.MaxLength} characters.", "$header.Idempotency-Key", "idempotency.key");
        }

        var hash = IdempotencyKeys.Hash(treeId + "\n" + body);
        if (key is not null && await store.GetIdempotencyAsync(scope, key, cancellationToken) is { } earlier)
        {
            return ScansApi.Replay(earlier, hash);
        }

        var parsed = OrchardJson.Parse<OutcomeReport>(body);
        if (!parsed.Succeeded)
        {
            return Problems.Invalid(400, "The outcome is not readable", parsed.Problems);
        }

        var report = parsed.Value!;
        var tree = await store.GetTreeAsync(treeId, cancellationToken);
        if (tree is null)
        {
            return Problems.Of(404, "No such tree", $"No tree '{treeId}'.");
        }

        var current = await store.GetCurrentScheduleAsync(treeId, cancellationToken);
        var errors = OutcomeValidator.Validate(report, current);
        if (errors.Count > 0)
        {
            return Problems.Invalid(422, "The outcome is not valid", errors);
        }

        string? payload = null;
        if (report.Outcome == "missed")
        {
            var earlierOutcomes = await store.ListOutcomesAsync(treeId, cancellationToken);
            var done = earlierOutcomes.Where(o => o.Outcome == "done").Select(o => o.CutId).Distinct().ToArray();
            var dropped = earlierOutcomes.Where(o => o.Outcome == "skipped").Select(o => o.CutId).Distinct().ToArray();
            var schedule = current is null ? null : OrchardJson.Parse<Core.Model.Schedule>(current.ScheduleJson).Value;
            var stop = schedule?.Stops.FirstOrDefault(s => s.Steps.Any(x => x.CutId == report.CutId));
            payload = OrchardJson.Serialize(new ReplanPayload(report.Configuration!, done, dropped, report.CutId, tree.RetryPolicy, stop?.ArmBase));
        }

        var accepted = new OutcomeAccepted(treeId, report.Version, report.CutId, report.Outcome, null);
        var provisional = OrchardJson.Serialize(accepted);
        var record = key is null ? null : new IdempotencyRecord(scope, key, hash, StatusCodes.Status202Accepted, provisional, null);
        var result = await store.RecordOutcomeAsync(new OutcomeSubmission(treeId, report.Version, report.CutId, report.Outcome, null, tree.LatestScanId), payload, record, cancellationToken);
        if (result.Replayed is { } first)
        {
            return ScansApi.Replay(first, hash);
        }

        if (!result.Accepted)
        {
            return TypedResults.Problem(
                title: "Stale schedule version",
                detail: $"The outcome refers to version {report.Version}; the current version is {result.CurrentVersion}.",
                statusCode: StatusCodes.Status409Conflict,
                extensions: new Dictionary<string, object?> { ["currentVersion"] = result.CurrentVersion, ["errors"] = new[] { new { path = "$.version", code = "version.stale", message = $"Current version is {result.CurrentVersion}." } } });
        }

        if (result.ReplanJobId is not null)
        {
            signal.Notify();
        }

        await CutDurations.RecordAsync(store, tree, report, cancellationToken);

        return TypedResults.Accepted(result.ReplanJobId is null ? (string?)null : $"/api/v1/jobs/{result.ReplanJobId}", accepted with { ReplanJobId = result.ReplanJobId });
    }
}
