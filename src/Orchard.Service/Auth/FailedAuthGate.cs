namespace Orchard.Service.Auth;

/// <summary>
/// In front of authentication: an address blocked by <see cref="FailedAuthLimiter"/> gets 429 (a problem,
/// with Retry-After) for a sign-in or for an API key it was not already using, without looking anything up.
/// </summary>
public sealed class FailedAuthGate(RequestDelegate next, FailedAuthLimiter limiter, ApiKeyCache keys)
{
    public async Task InvokeAsync(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (limiter.BlockedFor(context) is { } wait && IsAttempt(context))
        {
            context.Response.Headers.RetryAfter = FailedAuthLimiter.RetryAfter(wait);
            await Results.Problem(
                title: "Too many failed sign-ins",
                detail: $"This address failed to authenticate {limiter.PerMinute} times within a minute; try again in {FailedAuthLimiter.RetryAfter(wait)} s.",
                statusCode: StatusCodes.Status429TooManyRequests).ExecuteAsync(context);
            return;
        }

        await next(context);
    }

    private bool IsAttempt(HttpContext context)
    {
        if (HttpMethods.IsPost(context.Request.Method) && context.Request.Path.Equals("/review/sign-in", StringComparison.Ordinal))
        {
            return true;
        }

        return context.Request.Headers.TryGetValue(ApiKeySecrets.HeaderName, out var values)
            && !(values.Count == 1 && !string.IsNullOrWhiteSpace(values[0]) && keys.WasRecentlyUsable(ApiKeySecrets.HashHex(values[0]!)));
    }
}
