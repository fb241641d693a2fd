using System.Threading.RateLimiting;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Authentication.Cookies;
using Microsoft.AspNetCore.Diagnostics;
using Microsoft.AspNetCore.Http.Features;
using Orchard.Service.Api;
using Orchard.Service.Review;
using Orchard.Service.Auth;
using Orchard.Service.Workers;
using Orchard.Store;
using OpenTelemetry.Metrics;
using Serilog;
using Serilog.Formatting.Compact;

namespace Orchard.Service.Hosting;

/// <summary>What the web host is made of; each part is one extension method, so building it reads as a table of contents.</summary>
public static class OrchardHost
{
    /// <summary>Builds the API host (<paramref name="withApi"/>) and/or planning workers (<paramref name="withWorkers"/>).</summary>
    public static WebApplication Build(string[] args, bool withApi, bool withWorkers, Action<WebApplicationBuilder>? configure = null)
    {
        // The application name is fixed (it names the API's default tag), whichever process hosts it.
        var builder = WebApplication.CreateBuilder(new WebApplicationOptions { Args = args, ApplicationName = typeof(OrchardHost).Assembly.GetName().Name });
        configure?.Invoke(builder);
        builder.AddOrchardLogging();
        builder.Services.AddOrchardCore(builder.Configuration);
        builder.Services.AddOrchardAuth();
        builder.Services.AddOrchardProblems();
        builder.Services.AddOrchardRateLimits(builder.Configuration);
        builder.Services.AddOrchardMetrics();
        // Numbers are numbers: the API refuses numbers sent as strings, so the document must not offer them.
        builder.Services.ConfigureHttpJsonOptions(o => o.SerializerOptions.NumberHandling = System.Text.Json.Serialization.JsonNumberHandling.Strict);
        builder.Services.AddOpenApi(o =>
        {
            o.AddDocumentTransformer((document, _, _) =>
            {
                // The same document wherever it is served from, so the checked-in copy can be compared.
                document.Info.Title = "Orchard API";
                document.Info.Description = "Tree scans in, timed cut schedules out. Send the API key in the X-Api-Key header. Plans motions only: the arm controller's own safety functions always take precedence.";
                document.Servers = [new Microsoft.OpenApi.OpenApiServer { Url = "/" }];
                return Task.CompletedTask;
            });
            ApiDocumentation.Configure(o);
        });
        builder.WebHost.ConfigureKestrel(k => k.Limits.MaxRequestBodySize = builder.Configuration.GetSection(OrchardOptions.Section).Get<OrchardOptions>()?.MaxBodyBytes ?? new OrchardOptions().MaxBodyBytes);
        if (withWorkers)
        {
            builder.Services.AddOrchardWorkers(builder.Configuration);
        }

        var app = builder.Build();
        app.UseOrchardPipeline();
        if (withApi)
        {
            app.MapOrchardApi();
        }

        app.MapHealth();
        return app;
    }

    public static void AddOrchardLogging(this WebApplicationBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        var json = !builder.Environment.IsDevelopment();
        var level = Enum.TryParse<Serilog.Events.LogEventLevel>(builder.Configuration[$"{OrchardOptions.Section}:LogLevel"], ignoreCase: true, out var configured)
            ? configured
            : Serilog.Events.LogEventLevel.Information;
        builder.Services.AddSerilog(cfg =>
        {
            cfg.MinimumLevel.Is(level)
                .MinimumLevel.Override("Microsoft.AspNetCore", Serilog.Events.LogEventLevel.Warning)
                .Enrich.FromLogContext();
            if (json)
            {
                cfg.WriteTo.Console(new RenderedCompactJsonFormatter());
            }
            else
            {
                cfg.WriteTo.Console();
            }
        });
    }

    public static IServiceCollection AddOrchardCore(this IServiceCollection services, IConfiguration configuration)
    {
        services.Configure<OrchardOptions>(configuration.GetSection(OrchardOptions.Section));
        services.AddSingleton(TimeProvider.System);
        services.AddSingleton<JobSignal>();
        services.AddSingleton<ScheduleBodyCache>();
        services.AddSingleton<IOrchardStore>(sp =>
            StoreFactory.Create(sp.GetRequiredService<Microsoft.Extensions.Options.IOptions<OrchardOptions>>().Value, sp.GetRequiredService<TimeProvider>()));
        services.AddHostedService<StoreStartup>();
        return services;
    }

    public static IServiceCollection AddOrchardMetrics(this IServiceCollection services)
    {
        services.AddSingleton<OrchardMetrics>();
        services.AddHostedService<QueueSampler>();
        services.AddOpenTelemetry().WithMetrics(m => m
            .AddMeter(OrchardMetrics.MeterName, "Microsoft.AspNetCore.Hosting", "Microsoft.AspNetCore.Server.Kestrel")
            .AddPrometheusExporter());
        return services;
    }

    public static IServiceCollection AddOrchardAuth(this IServiceCollection services)
    {
        // Machines send X-Api-Key; a manager's browser signs in once with a key and then carries a
        // session cookie (HttpOnly, SameSite=Strict), never the key itself in a URL.
        services.AddSingleton<ApiKeyCache>();
        services.AddAuthentication("Orchard")
            .AddPolicyScheme("Orchard", "API key or review session", o => o.ForwardDefaultSelector = context =>
                context.Request.Headers.ContainsKey(ApiKeySecrets.HeaderName) ? ApiKeyAuthenticationHandler.SchemeName : CookieAuthenticationDefaults.AuthenticationScheme)
            .AddScheme<AuthenticationSchemeOptions, ApiKeyAuthenticationHandler>(ApiKeyAuthenticationHandler.SchemeName, _ => { })
            .AddCookie(CookieAuthenticationDefaults.AuthenticationScheme, o =>
            {
                o.Cookie.Name = "orchard_review";
                o.Cookie.HttpOnly = true;
                o.Cookie.SameSite = SameSiteMode.Strict;
                o.ExpireTimeSpan = TimeSpan.FromHours(12);
                o.SlidingExpiration = true;
                o.Events.OnRedirectToLogin = c => { c.Response.StatusCode = StatusCodes.Status401Unauthorized; return Task.CompletedTask; };
                o.Events.OnRedirectToAccessDenied = c => { c.Response.StatusCode = StatusCodes.Status403Forbidden; return Task.CompletedTask; };
            });
        services.AddAuthorization();
        return services;
    }

    public static IServiceCollection AddOrchardProblems(this IServiceCollection services)
    {
        services.AddExceptionHandler<StoreOutageHandler>();
        return services.AddProblemDetails(o => o.CustomizeProblemDetails = c => c.ProblemDetails.Extensions.TryAdd("traceId", c.HttpContext.TraceIdentifier));
    }

    public static IServiceCollection AddOrchardRateLimits(this IServiceCollection services, IConfiguration configuration)
    {
        var perMinute = configuration.GetSection(OrchardOptions.Section).Get<OrchardOptions>()?.RequestsPerMinute ?? new OrchardOptions().RequestsPerMinute;
        return services.AddRateLimiter(o =>
        {
            o.GlobalLimiter = PartitionedRateLimiter.Create<HttpContext, string>(context =>
                RateLimitPartition.GetFixedWindowLimiter(
                    context.Request.Headers[ApiKeySecrets.HeaderName].ToString() is { Length: > 0 } key ? "key:" + ApiKeySecrets.HashHex(key) : "ip:" + context.Connection.RemoteIpAddress,
                    _ => new FixedWindowRateLimiterOptions { PermitLimit = perMinute, Window = TimeSpan.FromMinutes(1), QueueLimit = 0 }));
            o.RejectionStatusCode = StatusCodes.Status429TooManyRequests;
            o.OnRejected = async (context, token) =>
            {
                var retry = context.Lease.TryGetMetadata(MetadataName.RetryAfter, out var after) ? (int)Math.Ceiling(after.TotalSeconds) : 60;
                context.HttpContext.Response.Headers.RetryAfter = retry.ToString(System.Globalization.CultureInfo.InvariantCulture);
                await Results.Problem(title: "Too many requests", detail: $"Try again in {retry} s.", statusCode: 429).ExecuteAsync(context.HttpContext);
            };
        });
    }

    public static IServiceCollection AddOrchardWorkers(this IServiceCollection services, IConfiguration configuration)
    {
        var count = Math.Clamp(configuration.GetSection(OrchardOptions.Section).Get<OrchardOptions>()?.Workers ?? 1, 0, 64);
        for (var i = 0; i < count; i++)
        {
            services.AddSingleton<IHostedService, PlanWorker>();
        }

        return services;
    }

    public static void UseOrchardPipeline(this WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        // Request logging wraps the exception handler, so each request is logged once with the status sent.
        app.UseSerilogRequestLogging();
        // Store outages are answered by StoreOutageHandler (503); anything else is a 500 problem, logged.
        app.UseExceptionHandler(handler => handler.Run(async context =>
        {
            var error = context.Features.Get<IExceptionHandlerFeature>()?.Error;
            var (status, title) = error is BadHttpRequestException bad ? (bad.StatusCode, "Bad request") : (StatusCodes.Status500InternalServerError, "Internal error");
            await Results.Problem(title: title, detail: status == 500 ? "The server could not complete the request; it is logged." : error?.Message, statusCode: status).ExecuteAsync(context);
        }));
        app.UseStatusCodePages();
        app.UseRateLimiter();
        app.UseAuthentication();
        app.UseAuthorization();
    }

    public static void MapOrchardApi(this WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.MapOpenApi("/openapi/v1.json").AllowAnonymous();
        app.MapGroup("/api/v1")
            .DocumentAnswers()
            .MapScans()
            .MapJobs()
            .MapTrees()
            .MapEstimates()
            .MapRows()
            .MapAdmin();
        app.MapReview();
    }

    public static void MapHealth(this WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.MapGet("/health/live", () => TypedResults.Ok(new HealthStatus("live"))).AllowAnonymous().DisableRateLimiting().DocumentHealth(ready: false);
        app.MapPrometheusScrapingEndpoint("/metrics").AllowAnonymous().DisableRateLimiting();
        app.MapGet("/health/ready", async (IOrchardStore store, CancellationToken ct) =>
            await store.PingAsync(ct) ? Results.Ok(new HealthStatus("ready", store.Kind)) : Results.Problem(title: "Store unreachable", statusCode: 503))
            .AllowAnonymous().DisableRateLimiting().DocumentHealth(ready: true);
    }
}
