using Microsoft.Extensions.Options;

namespace Orchard.Service.Hosting;

/// <summary>On the metrics port (Orchard:MetricsPort) only <c>/metrics</c> is answered; everything else there is 404.</summary>
public sealed class MetricsPortGate(RequestDelegate next, IOptions<OrchardOptions> options)
{
    public Task InvokeAsync(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (options.Value.MetricsPort is > 0 and var port && context.Connection.LocalPort == port && !context.Request.Path.Equals("/metrics", StringComparison.Ordinal))
        {
            context.Response.StatusCode = StatusCodes.Status404NotFound;
            return Task.CompletedTask;
        }

        return next(context);
    }
}
