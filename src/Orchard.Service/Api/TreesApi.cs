using System.Security.Claims;
using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Service.Application;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>
/// Trees: the manager's listing, the controller's current schedule (ETag = version, If-None-Match → 304;
/// only a schedule of the tree's newest scan is current) and cut outcomes (a stale version, a re-scanned
/// tree or a repeated outcome → 409; <c>missed</c> starts a re-plan).
/// </summary>
public static class TreesApi
{
    public static RouteGroupBuilder MapTrees(this RouteGroupBuilder api)
    {
        api.MapGet("/trees", ListTrees).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin)).WithSummary("Every tree with its latest plan's totals.");
        api.MapGet("/trees/{treeId}/schedule", GetSchedule).RequireAuthorization(p => p.RequireRole(Roles.Controller, Roles.Manager, Roles.Admin))
            .WithSummary("The tree's current schedule (planned from its newest scan); ETag is its version.");
        api.MapGet("/trees/{treeId}/scan", GetScan).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("The tree's newest scan, for drawing it.");
        api.MapPost("/trees/{treeId}/outcomes", PostOutcome).RequireAuthorization(p => p.RequireRole(Roles.Controller, Roles.Admin))
            .AddEndpointFilter<IdempotencyFilter>()
            .WithSummary("Report a cut's outcome against a schedule version.")
            .Accepts<OutcomeReport>("application/json")
            .Produces<OutcomeAccepted>(StatusCodes.Status202Accepted)
            .ProducesProblem(StatusCodes.Status409Conflict)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity);
        return api;
    }

    internal static async Task<Ok<TreeSummary[]>> ListTrees(IOrchardStore store, CancellationToken cancellationToken)
    {
        var trees = await store.ListTreesAsync(cancellationToken);
        return TypedResults.Ok(trees.OrderBy(t => t.Block, StringComparer.Ordinal).ThenBy(t => t.Row, StringComparer.Ordinal).ThenBy(t => t.PositionInRow)
            .Select(t => new TreeSummary(t.TreeId, t.Block, t.Row, t.PositionInRow, t.LatestScanId, t.CurrentVersion, t.CurrentScanId, t.IsPlannedForLatestScan,
                t.TotalSeconds, t.StepCount, t.UnscheduledCount, t.ArmProfileId)).ToArray());
    }

    internal static async Task<IResult> GetScan(string treeId, IOrchardStore store, CancellationToken cancellationToken)
    {
        var tree = await store.GetTreeAsync(treeId, cancellationToken);
        var scan = tree is null ? null : await store.GetScanAsync(tree.LatestScanId, cancellationToken);
        return scan is null ? Problems.Of(404, "No such tree", $"No tree '{treeId}'.") : TypedResults.Text(scan, "application/json");
    }

    internal static async Task<IResult> GetSchedule(string treeId, HttpRequest request, HttpResponse response, ScheduleReader schedules, CancellationToken cancellationToken)
    {
        switch (await schedules.CurrentAsync(treeId, cancellationToken))
        {
            case ScheduleRead.Current current:
                var etag = $"\"v{current.Version}\"";
                response.Headers.ETag = etag;
                return request.Headers.IfNoneMatch.Any(v => v is not null && v.Split(',').Any(t => t.Trim() == etag || t.Trim() == "*"))
                    ? TypedResults.StatusCode(StatusCodes.Status304NotModified)
                    : TypedResults.Bytes(current.Body, "application/json");
            case ScheduleRead.NotPlanned notPlanned:
                return NotPlanned(notPlanned.Tree);
            default:
                return Problems.Of(404, "No such tree", $"No tree '{treeId}'.");
        }
    }

    internal static async Task<IResult> PostOutcome(string treeId, JsonBody body, IdempotencyKey idempotency, ClaimsPrincipal user, OutcomeIntake intake, CancellationToken cancellationToken) =>
        Answers.From(await intake.RecordAsync(treeId, body.Utf8, Caller.Of(user), idempotency.Context, cancellationToken));

    /// <summary>
    /// No schedule of the tree as it stands now: never planned yet, or scanned again and its new plan still
    /// on the way (the old schedule is of a tree that no longer stands so, and is not served as current).
    /// </summary>
    private static ProblemHttpResult NotPlanned(TreeRecord tree) =>
        TypedResults.Problem(
            title: "Not planned yet",
            detail: tree.CurrentVersion is null
                ? $"Tree '{tree.TreeId}' has no schedule yet; watch its plan job."
                : $"Tree '{tree.TreeId}' was scanned again after version {tree.CurrentVersion} was planned; the schedule of its newest scan is on the way. Do not go on with version {tree.CurrentVersion}.",
            statusCode: StatusCodes.Status404NotFound,
            extensions: new Dictionary<string, object?> { ["scanId"] = tree.LatestScanId, ["previousVersion"] = tree.CurrentVersion });
}
