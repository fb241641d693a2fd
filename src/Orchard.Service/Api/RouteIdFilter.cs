using Orchard.Core.Validation;

namespace Orchard.Service.Api;

/// <summary>
/// Every id in an API address (<c>{treeId}</c>, <c>{jobId}</c>, <c>{armId}</c>, <c>{keyId}</c>) must match
/// <see cref="IdPattern"/>, or the request gets 422 naming the pattern: an id that cannot be stored can
/// never be found, and one with <c>%2F</c> or look-alike characters must not alias another.
/// </summary>
public sealed class RouteIdFilter : IEndpointFilter
{
    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(next);
        var problems = context.HttpContext.Request.RouteValues
            .Where(v => v.Key.EndsWith("Id", StringComparison.Ordinal) && v.Value is string)
            .Where(v => !IdPattern.IsValid((string)v.Value!))
            .Select(v => ValidationProblem.Error("$path." + v.Key, "id.pattern", IdPattern.Message))
            .ToList();
        return problems.Count > 0 ? Problems.Invalid(422, "Not an id", problems) : await next(context);
    }
}
