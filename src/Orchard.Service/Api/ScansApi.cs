using System.Security.Claims;
using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Service.Auth;
using Orchard.Service.Workers;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary><c>POST /api/v1/scans</c>: a field tablet posts a tree scan; 202 with the plan job's location.</summary>
public static class ScansApi
{
    public static RouteGroupBuilder MapScans(this RouteGroupBuilder api)
    {
        api.MapPost("/scans", PostScan)
            .RequireAuthorization(p => p.RequireRole(Roles.Tablet, Roles.Admin))
            .WithSummary("Post a tree scan; planning runs in the background.")
            .Accepts<TreeScan>("application/json")
            .Produces<ScanAccepted>(StatusCodes.Status202Accepted)
            .ProducesProblem(StatusCodes.Status400BadRequest)
            .ProducesProblem(StatusCodes.Status422UnprocessableEntity);
        return api;
    }

    internal static async Task<IResult> PostScan(HttpRequest request, ClaimsPrincipal user, IOrchardStore store, JobSignal signal, string? armProfileId, string? retryPolicy, CancellationToken cancellationToken)
    {
        using var reader = new StreamReader(request.Body);
        var body = await reader.ReadToEndAsync(cancellationToken);
        var scope = user.FindFirstValue(ClaimTypes.NameIdentifier) ?? "anonymous";
        var key = IdempotencyKeys.From(request);
        if (key == string.Empty)
        {
            return Problems.Of(400, "Bad Idempotency-Key", $"The Idempotency-Key header must be one non-blank value of at most {IdempotencyKeys.MaxLength} characters.", "$header.Idempotency-Key", "idempotency.key");
        }

        var hash = IdempotencyKeys.Hash(body);
        if (key is not null && await store.GetIdempotencyAsync(scope, key, cancellationToken) is { } earlier)
        {
            return Replay(earlier, hash);
        }

        var parsed = OrchardJson.Parse<TreeScan>(body);
        if (!parsed.Succeeded)
        {
            return Problems.Invalid(400, "The scan is not readable", parsed.Problems);
        }

        var policy = retryPolicy ?? "retryLast";
        if (policy is not ("retryNow" or "retryLast" or "drop"))
        {
            return Problems.Of(422, "Unknown retry policy", "retryPolicy must be retryNow, retryLast or drop.", "$query.retryPolicy", "retryPolicy.unknown");
        }

        var armId = armProfileId ?? DemoArm.Id;
        var armJson = await store.GetArmProfileAsync(armId, cancellationToken);
        if (armJson is null)
        {
            return Problems.Of(422, "Unknown arm profile", $"No arm profile '{armId}' is registered.", "$query.armProfileId", "armProfile.unknown");
        }

        var arm = OrchardJson.Parse<ArmProfile>(armJson).Value!;
        var report = TreeScanValidator.Validate(parsed.Value, shearRatingMm: arm.Tool.MaxCutDiameterMm);
        if (!report.IsValid)
        {
            return Problems.Invalid(422, "The scan is not valid", report.Problems);
        }

        var scan = parsed.Value!;
        var scanId = "scan-" + Guid.NewGuid().ToString("N");
        var jobId = "job-" + Guid.NewGuid().ToString("N");
        var accepted = new ScanAccepted(jobId, scan.TreeId, scanId, "queued", report.Warnings.Select(w => (object)new { path = w.Path, code = w.Code, message = w.Message }).ToArray());
        var location = $"/api/v1/jobs/{jobId}";
        var responseJson = OrchardJson.Serialize(accepted);
        var record = key is null ? null : new IdempotencyRecord(scope, key, hash, StatusCodes.Status202Accepted, responseJson, location);
        var submission = new ScanSubmission(scanId, jobId, scan.TreeId, scan.Block, scan.Row, scan.PositionInRow, armId, body, policy);
        var result = await store.AcceptScanAsync(submission, record, cancellationToken);
        if (result.Replayed is { } first)
        {
            return Replay(first, hash);
        }

        await TreeFeatureIndex.RecordScanAsync(store, scan.TreeId, scanId, scan, cancellationToken);
        signal.Notify();
        return TypedResults.Accepted(location, accepted);
    }

    /// <summary>The first answer again when the body matches; 422 when the same key came with another body.</summary>
    internal static IResult Replay(IdempotencyRecord earlier, string hash)
    {
        if (!ApiKeySecrets.FixedTimeEquals(earlier.RequestHashHex, hash))
        {
            return Problems.Of(422, "Idempotency-Key reused", "This Idempotency-Key was used with a different request body.", "$header.Idempotency-Key", "idempotency.conflict");
        }

        return new ReplayResult(earlier);
    }

    private sealed class ReplayResult(IdempotencyRecord record) : IResult
    {
        public async Task ExecuteAsync(HttpContext httpContext)
        {
            httpContext.Response.StatusCode = record.StatusCode;
            httpContext.Response.ContentType = "application/json";
            httpContext.Response.Headers["Idempotent-Replayed"] = "true";
            if (record.Location is not null)
            {
                httpContext.Response.Headers.Location = record.Location;
            }

            await httpContext.Response.WriteAsync(record.ResponseJson, httpContext.RequestAborted);
        }
    }
}
