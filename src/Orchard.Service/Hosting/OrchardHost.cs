using System.Security.Claims;
using System.Threading.RateLimiting;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Authentication.Cookies;
using Microsoft.AspNetCore.DataProtection;
using Microsoft.AspNetCore.DataProtection.KeyManagement;
using Microsoft.AspNetCore.Diagnostics;
using Microsoft.AspNetCore.Http.Features;
using Orchard.Service.Api;
using Orchard.Service.Application;
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
        builder.Services.AddOrchardAuth(builder.Configuration);
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
        if (builder.Configuration.GetSection(OrchardOptions.Section).Get<OrchardOptions>()?.MetricsPort is > 0 and var metricsPort)
        {
            // The metrics port is added to the addresses the service listens on (--urls or ASPNETCORE_URLS).
            var urls = builder.Configuration[WebHostDefaults.ServerUrlsKey] is { Length: > 0 } configured ? configured : "http://localhost:5000";
            builder.WebHost.UseSetting(WebHostDefaults.ServerUrlsKey, $"{urls};http://*:{metricsPort}");
        }
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
                // The key ring is kept in the store unencrypted on purpose (see StoreXmlRepository); its
                // "no XML encryptor" warning at every start would only teach people to ignore warnings.
                .MinimumLevel.Override("Microsoft.AspNetCore.DataProtection", Serilog.Events.LogEventLevel.Error)
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
        services.AddSingleton(sp =>
        {
            var options = sp.GetRequiredService<Microsoft.Extensions.Options.IOptions<OrchardOptions>>().Value;
            return new IntakePolicy(Math.Max(1, options.MaxOpenJobsPerKey), Math.Max(1, options.QuotaRetryAfterSeconds));
        });
        services.AddSingleton<ScanIntake>();
        services.AddSingleton<OutcomeIntake>();
        services.AddSingleton<KeyManagement>();
        services.AddSingleton<ArmProfiles>();
        services.AddSingleton<OrchardSetup>();
        services.AddSingleton<ScheduleReader>();
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

    public static IServiceCollection AddOrchardAuth(this IServiceCollection services, IConfiguration configuration)
    {
        // Machines send X-Api-Key. A manager's browser signs in once with a key and then carries a session
        // cookie (HttpOnly, SameSite=Strict) that is honoured only on GET (the page's reads), on sign-out and
        // on the page's rates form (origin and antiforgery checked); every unsafe API call needs the key
        // itself, so no other page can act through the cookie.
        var options = configuration.GetSection(OrchardOptions.Section).Get<OrchardOptions>() ?? new OrchardOptions();
        var lifetime = TimeSpan.FromHours(Math.Clamp(options.SessionHours, 0.05, 24 * 30));
        services.AddSingleton<ApiKeyCache>();
        services.AddSingleton<KeyUseRecorder>();
        services.AddSingleton(sp => new FailedAuthLimiter(options.FailedAuthPerMinute, sp.GetRequiredService<TimeProvider>()));
        services.AddSingleton(new SessionLifetime(lifetime));
        services.AddSingleton<SessionTicketStore>();
        services.AddSingleton<ITicketStore>(sp => sp.GetRequiredService<SessionTicketStore>());
        // The key ring that protects cookies and antiforgery tokens lives in the store, shared by every replica.
        services.AddDataProtection().SetApplicationName("Orchard");
        services.AddOptions<KeyManagementOptions>().Configure<IOrchardStore>((o, store) => o.XmlRepository = new StoreXmlRepository(store));
        services.AddAntiforgery(o =>
        {
            o.Cookie.Name = "orchard_af";
            o.Cookie.SameSite = SameSiteMode.Strict;
            o.Cookie.HttpOnly = true;
            o.FormFieldName = ReviewPage.AntiforgeryField;
            o.HeaderName = null;
            o.SuppressXFrameOptionsHeader = true;
        });
        services.AddAuthentication("Orchard")
            .AddPolicyScheme("Orchard", "API key or review session", o => o.ForwardDefaultSelector = context =>
                context.Request.Headers.ContainsKey(ApiKeySecrets.HeaderName) || !CookieMayAuthenticate(context.Request)
                    ? ApiKeyAuthenticationHandler.SchemeName
                    : CookieAuthenticationDefaults.AuthenticationScheme)
            .AddScheme<AuthenticationSchemeOptions, ApiKeyAuthenticationHandler>(ApiKeyAuthenticationHandler.SchemeName, _ => { })
            .AddCookie(CookieAuthenticationDefaults.AuthenticationScheme, o =>
            {
                o.Cookie.Name = "orchard_review";
                o.Cookie.HttpOnly = true;
                o.Cookie.SameSite = SameSiteMode.Strict;
                o.Cookie.SecurePolicy = CookieSecurePolicy.SameAsRequest;
                o.ExpireTimeSpan = lifetime;
                o.SlidingExpiration = false;
                o.Events.OnRedirectToLogin = c => { c.Response.StatusCode = StatusCodes.Status401Unauthorized; return Task.CompletedTask; };
                o.Events.OnRedirectToAccessDenied = c => { c.Response.StatusCode = StatusCodes.Status403Forbidden; return Task.CompletedTask; };
            });
        services.AddOptions<CookieAuthenticationOptions>(CookieAuthenticationDefaults.AuthenticationScheme).Configure<ITicketStore>((o, tickets) => o.SessionStore = tickets);
        services.AddAuthorization();
        return services;
    }

    /// <summary>
    /// The review cookie authenticates safe requests (the page's reads), sign-out and the page's rates form
    /// (which checks the page's origin and antiforgery token itself), nothing else: never an API write.
    /// </summary>
    private static bool CookieMayAuthenticate(HttpRequest request) =>
        HttpMethods.IsGet(request.Method) || HttpMethods.IsHead(request.Method)
        || (HttpMethods.IsPost(request.Method) && (request.Path.Equals("/review/sign-out", StringComparison.Ordinal) || request.Path.Equals("/review/rates", StringComparison.Ordinal)));

    public static IServiceCollection AddOrchardProblems(this IServiceCollection services)
    {
        services.AddExceptionHandler<StoreOutageHandler>();
        return services.AddProblemDetails(o => o.CustomizeProblemDetails = c =>
        {
            c.ProblemDetails.Extensions.TryAdd("traceId", c.HttpContext.TraceIdentifier);
            // Routing itself answers 415 for an endpoint that accepts JSON only; name the header there too.
            if (c.ProblemDetails.Status == StatusCodes.Status415UnsupportedMediaType && !c.ProblemDetails.Extensions.ContainsKey("errors"))
            {
                c.ProblemDetails.Detail ??= "A request body must be sent as application/json in UTF-8.";
                c.ProblemDetails.Extensions["errors"] = new[] { new { path = "$header.Content-Type", code = "contentType.notJson", message = c.ProblemDetails.Detail } };
            }
        });
    }

    public static IServiceCollection AddOrchardRateLimits(this IServiceCollection services, IConfiguration configuration)
    {
        // Buckets follow who was authenticated (the limiter runs after authentication): each key its own,
        // each review session its own, and only unauthenticated requests share one per client address, so a
        // stranger's requests never use up a manager's allowance and random keys are not a bucket each.
        var options = configuration.GetSection(OrchardOptions.Section).Get<OrchardOptions>() ?? new OrchardOptions();
        return services.AddRateLimiter(o =>
        {
            o.GlobalLimiter = PartitionedRateLimiter.Create<HttpContext, string>(context =>
            {
                var (partition, perMinute) = Partition(context, options);
                return RateLimitPartition.GetFixedWindowLimiter(partition, _ => new FixedWindowRateLimiterOptions { PermitLimit = perMinute, Window = TimeSpan.FromMinutes(1), QueueLimit = 0 });
            });
            o.RejectionStatusCode = StatusCodes.Status429TooManyRequests;
            o.OnRejected = async (context, token) =>
            {
                var retry = context.Lease.TryGetMetadata(MetadataName.RetryAfter, out var after) ? (int)Math.Ceiling(after.TotalSeconds) : 60;
                context.HttpContext.Response.Headers.RetryAfter = retry.ToString(System.Globalization.CultureInfo.InvariantCulture);
                await Results.Problem(title: "Too many requests", detail: $"Try again in {retry} s.", statusCode: 429).ExecuteAsync(context.HttpContext);
            };
        });
    }

    private static (string Partition, int PerMinute) Partition(HttpContext context, OrchardOptions options)
    {
        var user = context.User;
        if (user.Identity?.IsAuthenticated == true)
        {
            return user.FindFirstValue(SessionTicketStore.SessionClaim) is { } session
                ? ("session:" + session, Math.Max(1, options.RequestsPerMinute))
                : ("key:" + user.FindFirstValue(ClaimTypes.NameIdentifier), Math.Max(1, options.RequestsPerMinute));
        }

        return ("ip:" + context.Connection.RemoteIpAddress, Math.Max(1, options.AnonymousRequestsPerMinute));
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
        app.UseMiddleware<SecurityHeaders>();
        app.UseMiddleware<MetricsPortGate>();
        // Store outages are answered by StoreOutageHandler (503); anything else is a 500 problem, logged.
        app.UseExceptionHandler(handler => handler.Run(async context =>
        {
            var error = context.Features.Get<IExceptionHandlerFeature>()?.Error;
            var (status, title) = error is BadHttpRequestException bad ? (bad.StatusCode, "Bad request") : (StatusCodes.Status500InternalServerError, "Internal error");
            if (status == 500)
            {
                await Results.Problem(title: title, detail: "The server could not complete the request; it is logged.", statusCode: status).ExecuteAsync(context);
                return;
            }

            // A request Kestrel could not read (a body too large, cut off or too slow): the body is the field.
            await Problems.Of(status, title, error?.Message ?? title, "$", status == StatusCodes.Status413PayloadTooLarge ? "body.tooLarge" : "request.malformed").ExecuteAsync(context);
        }));
        app.UseStatusCodePages();
        app.UseMiddleware<FailedAuthGate>();
        app.UseAuthentication();
        app.UseRateLimiter();
        app.UseAuthorization();
    }

    public static void MapOrchardApi(this WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.MapOpenApi("/openapi/v1.json").AllowAnonymous();
        app.MapGroup("/api/v1")
            .AddEndpointFilter<RouteIdFilter>()
            .AddEndpointFilter<JsonContentTypeFilter>()
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
        // Metrics: on a port of their own (Orchard:MetricsPort) for a scraper inside the cluster, answered there
        // only; without one, on the service's port for admin keys only.
        var metricsPort = app.Services.GetRequiredService<Microsoft.Extensions.Options.IOptions<OrchardOptions>>().Value.MetricsPort;
        var metrics = app.MapPrometheusScrapingEndpoint("/metrics").DisableRateLimiting();
        if (metricsPort is > 0)
        {
            metrics.RequireHost($"*:{metricsPort}").AllowAnonymous();
        }
        else
        {
            metrics.RequireAuthorization(p => p.RequireRole(Roles.Admin));
        }
        app.MapGet("/health/ready", async (IOrchardStore store, CancellationToken ct) =>
            await store.PingAsync(ct) ? Results.Ok(new HealthStatus("ready", store.Kind)) : Results.Problem(title: "Store unreachable", statusCode: 503))
            .AllowAnonymous().DisableRateLimiting().DocumentHealth(ready: true);
    }
}
