using System.Globalization;
using Orchard.Service.Application;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>Turns what the application answers into HTTP: a JSON body with its Location, a problem (with Retry-After when set), or a replayed first answer.</summary>
public static class Answers
{
    public static IResult From(IntakeAnswer answer) => answer switch
    {
        IntakeAnswer.Accepted accepted => new AcceptedResult(accepted),
        IntakeAnswer.Refused refused => Refused(refused),
        IntakeAnswer.Replayed replayed => Replay(replayed.Record, replayed.RequestHashHex),
        _ => throw new ArgumentOutOfRangeException(nameof(answer)),
    };

    /// <summary>The first answer again when the request matches; 422 when the same key came with another request.</summary>
    public static IResult Replay(IdempotencyRecord earlier, string requestHashHex)
    {
        ArgumentNullException.ThrowIfNull(earlier);
        if (!ApiKeySecrets.FixedTimeEquals(earlier.RequestHashHex, requestHashHex))
        {
            return Problems.Of(422, "Idempotency-Key reused", "This Idempotency-Key was used with a different request.", "$header.Idempotency-Key", "idempotency.conflict");
        }

        return new ReplayResult(earlier);
    }

    private static IResult Refused(IntakeAnswer.Refused refused)
    {
        var problem = Problems.Invalid(refused.StatusCode, refused.Title, refused.Problems, extensions: refused.Extensions);
        return refused.RetryAfterSeconds is { } seconds ? new WithRetryAfter(problem, seconds) : problem;
    }

    private sealed class AcceptedResult(IntakeAnswer.Accepted accepted) : IResult
    {
        public Task ExecuteAsync(HttpContext httpContext)
        {
            if (accepted.Location is not null)
            {
                httpContext.Response.Headers.Location = accepted.Location;
            }

            if (accepted.CarriesSecret)
            {
                httpContext.Response.Headers.CacheControl = "no-store";
            }

            if (accepted.StatusCode == StatusCodes.Status204NoContent)
            {
                httpContext.Response.StatusCode = StatusCodes.Status204NoContent;
                return Task.CompletedTask;
            }

            return Results.Json(accepted.Body, statusCode: accepted.StatusCode).ExecuteAsync(httpContext);
        }
    }

    private sealed class WithRetryAfter(IResult inner, int seconds) : IResult
    {
        public Task ExecuteAsync(HttpContext httpContext)
        {
            httpContext.Response.Headers.RetryAfter = seconds.ToString(CultureInfo.InvariantCulture);
            return inner.ExecuteAsync(httpContext);
        }
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
