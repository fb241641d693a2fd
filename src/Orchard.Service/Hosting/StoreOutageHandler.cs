using Microsoft.AspNetCore.Diagnostics;
using Orchard.Store;

namespace Orchard.Service.Hosting;

/// <summary>
/// Answers a request that met a passing store fault (the database restarting or unreachable) with 503,
/// Retry-After and a problem, and logs one line without a stack trace: an outage is an operating event,
/// not a bug, and thousands of requests a second must not each write an error report.
/// </summary>
public sealed partial class StoreOutageHandler(ILogger<StoreOutageHandler> logger) : IExceptionHandler
{
    public const int RetryAfterSeconds = 5;

    public async ValueTask<bool> TryHandleAsync(HttpContext httpContext, Exception exception, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(httpContext);
        if (!StoreFaults.IsTransient(exception))
        {
            return false;
        }

        LogOutage(logger, httpContext.Request.Method, httpContext.Request.Path, exception.GetBaseException().Message);
        httpContext.Response.Headers.RetryAfter = RetryAfterSeconds.ToString(System.Globalization.CultureInfo.InvariantCulture);
        // A write cut off at its commit may still have landed, hence "the same Idempotency-Key".
        await Results.Problem(
            title: "Store unavailable",
            detail: "The database cannot be reached right now. Try again shortly; send a POST again with the same Idempotency-Key so it is applied at most once.",
            statusCode: StatusCodes.Status503ServiceUnavailable).ExecuteAsync(httpContext);
        return true;
    }

    [LoggerMessage(Level = LogLevel.Warning, Message = "Store unavailable for {Method} {Path}: {Reason}")]
    private static partial void LogOutage(ILogger logger, string method, string path, string reason);
}
