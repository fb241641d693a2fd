using Microsoft.AspNetCore.Http.Features;
using Microsoft.Net.Http.Headers;

namespace Orchard.Service.Api;

/// <summary>
/// Every API request that carries a body must say it is JSON (<c>application/json</c>, or another
/// <c>+json</c> type, in UTF-8): a page on another origin can post <c>text/plain</c> or a form without asking
/// first, but never JSON, so this also keeps forged bodies out. Anything else gets 415 naming the header.
/// </summary>
public sealed class JsonContentTypeFilter : IEndpointFilter
{
    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(next);
        var http = context.HttpContext;
        var hasBody = http.Features.Get<IHttpRequestBodyDetectionFeature>()?.CanHaveBody ?? http.Request.ContentLength > 0;
        if (hasBody && !IsJson(http.Request.ContentType))
        {
            return Problems.Of(415, "JSON expected", $"A request body must be sent as application/json in UTF-8; it came as '{http.Request.ContentType ?? "(no Content-Type)"}'.", "$header.Content-Type", "contentType.notJson");
        }

        return await next(context);
    }

    public static bool IsJson(string? contentType) =>
        MediaTypeHeaderValue.TryParse(contentType, out var media)
        && media.MediaType.Value is { } type
        && (type.Equals("application/json", StringComparison.OrdinalIgnoreCase)
            || (type.StartsWith("application/", StringComparison.OrdinalIgnoreCase) && type.EndsWith("+json", StringComparison.OrdinalIgnoreCase)))
        && (media.Charset.Value is not { } charset || charset.Equals("utf-8", StringComparison.OrdinalIgnoreCase));
}
