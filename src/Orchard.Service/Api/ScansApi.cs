using System.Security.Claims;
using Orchard.Core.Model;
using Orchard.Service.Application;
using Orchard.Service.Auth;

namespace Orchard.Service.Api;

/// <summary><c>POST /api/v1/scans</c>: a field tablet posts a tree scan; 202 with the plan job's location.</summary>
public static class ScansApi
{
    public static RouteGroupBuilder MapScans(this RouteGroupBuilder api)
    {
        api.MapPost("/scans", PostScan)
            .RequireAuthorization(p => p.RequireRole(Roles.Tablet, Roles.Admin))
            .AddEndpointFilter<IdempotencyFilter>()
            .WithSummary("Post a tree scan; planning runs in the background.")
            .Accepts<TreeScan>("application/json")
            .Produces<ScanAccepted>(StatusCodes.Status202Accepted)
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity)
            .ProducesProblem(StatusCodes.Status429TooManyRequests);
        return api;
    }

    internal static async Task<IResult> PostScan(JsonBody body, IdempotencyKey idempotency, ClaimsPrincipal user, ScanIntake intake, string? armProfileId, string? retryPolicy, CancellationToken cancellationToken) =>
        Answers.From(await intake.AcceptAsync(body.Utf8, armProfileId, retryPolicy, Caller.Of(user), idempotency.Context, cancellationToken));
}
