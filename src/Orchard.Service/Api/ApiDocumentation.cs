using Microsoft.AspNetCore.Http.Metadata;
using Microsoft.AspNetCore.OpenApi;
using Microsoft.OpenApi;
using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Timing;
using Orchard.Service.Application;
using Orchard.Service.Auth;

namespace Orchard.Service.Api;

/// <summary>
/// What the OpenAPI document says each endpoint answers: one table, (method, route) → every status the
/// server sends with the schema of its body, applied after every other convention so it replaces what the
/// framework guessed from the handlers (which answer raw JSON text in places). Plus the API-key security
/// scheme, and units and joint order on the schedule's joint values. <c>OpenApiWalkTests</c> reaches every
/// documented status against the running server and validates every body against its schema.
/// </summary>
public static class ApiDocumentation
{
    public const string SecuritySchemeId = "apiKey";

    private const string Json = "application/json";
    private const string ProblemJson = "application/problem+json";

    /// <summary>Every authenticated endpoint: no or a bad key, too many requests (or too many failed authentications; a key's queue quota), the store unreachable.</summary>
    private static readonly Answer[] Guarded = [Problem(401), Problem(429), Problem(503)];

    /// <summary>
    /// Endpoints that read a JSON body: unreadable (syntax, types, refused members; a bad Idempotency-Key), too
    /// large, not sent as JSON, readable but invalid (or an id in the address off the pattern).
    /// </summary>
    private static readonly Answer[] WithBody = [Problem(400), Problem(413), Problem(415), Problem(422)];

    private static readonly Dictionary<(string Method, string Route), Answer[]> Answers = new()
    {
        [("POST", "/api/v1/scans")] = [Ok(202, typeof(ScanAccepted)), Problem(403), .. WithBody, .. Guarded],
        [("GET", "/api/v1/jobs/{jobId}")] = [Ok(200, typeof(JobView)), Problem(404), Problem(422), .. Guarded],
        [("GET", "/api/v1/trees")] = [Ok(200, typeof(TreeSummary[])), Problem(403), .. Guarded],
        [("GET", "/api/v1/trees/{treeId}/schedule")] = [Ok(200, typeof(Schedule)), new(304, typeof(void), null), Problem(403), Problem(404), Problem(422), .. Guarded],
        [("GET", "/api/v1/trees/{treeId}/scan")] = [Ok(200, typeof(TreeScan)), Problem(403), Problem(404), Problem(422), .. Guarded],
        [("POST", "/api/v1/trees/{treeId}/outcomes")] = [Ok(202, typeof(OutcomeAccepted)), Problem(403), Problem(404), Problem(409), .. WithBody, .. Guarded],
        [("GET", "/api/v1/estimates")] = [Ok(200, typeof(EstimatesView)), Problem(400), Problem(403), .. Guarded],
        [("GET", "/api/v1/estimates.csv")] = [new(200, typeof(string), "text/csv"), Problem(400), Problem(403), .. Guarded],
        [("PUT", "/api/v1/rows")] = [Ok(200, typeof(RowsSaved)), Problem(403), .. WithBody, .. Guarded],
        [("GET", "/api/v1/rows")] = [Ok(200, typeof(RowRegistry)), Problem(403), .. Guarded],
        [("PUT", "/api/v1/rates")] = [Ok(200, typeof(ReferenceRates)), Problem(403), .. WithBody, .. Guarded],
        [("GET", "/api/v1/rates")] = [Ok(200, typeof(ReferenceRates)), Problem(403), .. Guarded],
        [("PUT", "/api/v1/arm-profiles/{armId}")] = [Ok(200, typeof(ArmProfile)), Problem(403), .. WithBody, .. Guarded],
        [("GET", "/api/v1/arm-profiles/{armId}")] = [Ok(200, typeof(ArmProfile)), Problem(403), Problem(404), Problem(422), .. Guarded],
        [("GET", "/api/v1/arm-profiles")] = [Ok(200, typeof(string[])), Problem(403), .. Guarded],
        [("POST", "/api/v1/api-keys")] = [Ok(201, typeof(ApiKeyCreated)), Problem(403), .. WithBody, .. Guarded],
        [("GET", "/api/v1/api-keys")] = [Ok(200, typeof(ApiKeyView[])), Problem(403), .. Guarded],
        [("DELETE", "/api/v1/api-keys/{keyId}")] = [new(204, typeof(void), null), Problem(403), Problem(404), Problem(409), Problem(422), .. Guarded],
        [("GET", "/api/v1/audit")] = [Ok(200, typeof(AuditView[])), Problem(400), Problem(403), .. Guarded],
    };

    /// <summary>Health: alive (200), and ready (200) or not (503, the store does not answer). No key needed.</summary>
    public static RouteHandlerBuilder DocumentHealth(this RouteHandlerBuilder endpoint, bool ready)
    {
        ArgumentNullException.ThrowIfNull(endpoint);
        endpoint.Produces<HealthStatus>(StatusCodes.Status200OK, Json);
        return ready ? endpoint.Produces<ProblemBody>(StatusCodes.Status503ServiceUnavailable, ProblemJson) : endpoint;
    }

    /// <summary>The documented answers of one endpoint, or null when the table has none.</summary>
    public static IReadOnlyList<(int Status, Type? Body, string? ContentType)>? AnswersOf(string method, string route) =>
        Answers.TryGetValue((method, route), out var answers) ? answers.Select(a => (a.Status, a.Body, a.ContentType)).ToArray() : null;

    /// <summary>Replaces the guessed response metadata of every endpoint of <paramref name="api"/> with the table's.</summary>
    public static RouteGroupBuilder DocumentAnswers(this RouteGroupBuilder api)
    {
        ArgumentNullException.ThrowIfNull(api);
        ((IEndpointConventionBuilder)api).Finally(builder =>
        {
            if (builder is not RouteEndpointBuilder route || route.RoutePattern.RawText is not { } pattern)
            {
                return;
            }

            var method = builder.Metadata.OfType<IHttpMethodMetadata>().SelectMany(m => m.HttpMethods).FirstOrDefault();
            if (method is null || !Answers.TryGetValue((method, pattern), out var answers))
            {
                return;
            }

            for (var i = builder.Metadata.Count - 1; i >= 0; i--)
            {
                if (builder.Metadata[i] is IProducesResponseTypeMetadata)
                {
                    builder.Metadata.RemoveAt(i);
                }
            }

            foreach (var answer in answers)
            {
                builder.Metadata.Add(new ProducesResponseTypeMetadata(answer.Status, answer.Body, answer.ContentType is null ? [] : [answer.ContentType]));
            }
        });
        return api;
    }

    /// <summary>The security scheme, units on joint values, and numbers that are numbers.</summary>
    public static void Configure(OpenApiOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        options.AddDocumentTransformer((document, _, _) =>
        {
            document.Components ??= new OpenApiComponents();
            document.Components.SecuritySchemes ??= new Dictionary<string, IOpenApiSecurityScheme>();
            document.Components.SecuritySchemes[SecuritySchemeId] = new OpenApiSecurityScheme
            {
                Type = SecuritySchemeType.ApiKey,
                In = ParameterLocation.Header,
                Name = ApiKeySecrets.HeaderName,
                Description = "An API key made by an admin (POST /api/v1/api-keys); its role (tablet, controller, manager, admin) decides what it may do.",
            };
            document.Security = [new OpenApiSecurityRequirement { [new OpenApiSecuritySchemeReference(SecuritySchemeId, document)] = [] }];

            // An enum's own schema lists its values only: where a property may be null, the property says so
            // (oneOf null or the enum); a null inside the enum as well would make null match both and be refused.
            foreach (var schema in document.Components.Schemas?.Values.OfType<OpenApiSchema>() ?? [])
            {
                for (var i = (schema.Enum?.Count ?? 0) - 1; i >= 0; i--)
                {
                    if (schema.Enum![i] is null || schema.Enum[i]!.GetValueKind() == System.Text.Json.JsonValueKind.Null)
                    {
                        schema.Enum.RemoveAt(i);
                    }
                }
            }

            return Task.CompletedTask;
        });
        options.AddOperationTransformer((operation, context, _) =>
        {
            // Health answers without a key.
            if (context.Description.RelativePath?.StartsWith("health", StringComparison.Ordinal) == true)
            {
                operation.Security = [];
            }

            return Task.CompletedTask;
        });
        options.AddSchemaTransformer((schema, context, _) =>
        {
            var property = context.JsonPropertyInfo;
            if (property is null)
            {
                if (context.JsonTypeInfo.Type == typeof(Cut) && schema.Required is { } required)
                {
                    required.Remove("positionAlong"); // Placed by the kind for cutBack and renewal cuts.
                }

                return Task.CompletedTask;
            }

            var owner = property.DeclaringType;

            if ((owner == typeof(ScheduleStep) || owner == typeof(ScheduleStop) || owner == typeof(ArmProfile)) && property.Name.EndsWith("Configuration", StringComparison.Ordinal))
            {
                schema.Description = JointValues;
            }
            else if (owner == typeof(TrajectoryPoint) && property.Name is "positions" or "velocities")
            {
                schema.Description = property.Name == "positions" ? JointValues : JointValues.Replace("radians", "rad/s", StringComparison.Ordinal).Replace("metres", "m/s", StringComparison.Ordinal);
            }
            else if (owner == typeof(TrajectoryPoint) && property.Name == "timeS")
            {
                schema.Description = "Seconds from the start of this trajectory.";
            }

            return Task.CompletedTask;
        });
    }

    private const string JointValues =
        "One value per joint, in the order of the arm profile's joints (GET /api/v1/arm-profiles/{armProfileId}: joints[i].name; the demo arm: lift, turret, shoulder, elbow, forearm-roll, wrist-pitch, flange-roll): " +
        "radians for a revolute joint, metres for a prismatic one (URDF convention).";

    private static Answer Ok(int status, Type body) => new(status, body, Json);

    private static Answer Problem(int status) => new(status, typeof(ProblemBody), ProblemJson);

    private sealed record Answer(int Status, Type? Body, string? ContentType);
}
