using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using ValidationProblem = Orchard.Core.Validation.ValidationProblem;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>Admin: arm profiles and API keys.</summary>
public static class AdminApi
{
    public static RouteGroupBuilder MapAdmin(this RouteGroupBuilder api)
    {
        var admin = api.MapGroup(string.Empty).RequireAuthorization(p => p.RequireRole(Roles.Admin));
        admin.MapPut("/arm-profiles/{armId}", PutArmProfile).Accepts<ArmProfile>("application/json").WithSummary("Register or replace an arm profile.");
        admin.MapGet("/arm-profiles/{armId}", GetArmProfile).WithSummary("An arm profile.");
        admin.MapGet("/arm-profiles", ListArmProfiles).WithSummary("Registered arm profile ids.");
        admin.MapPost("/api-keys", PostApiKey).WithSummary("Make an API key; its secret is shown once.");
        return api;
    }

    internal static async Task<Results<Ok<ArmProfile>, ProblemHttpResult>> PutArmProfile(string armId, HttpRequest request, IOrchardStore store, CancellationToken cancellationToken)
    {
        using var reader = new StreamReader(request.Body);
        var parsed = OrchardJson.Parse<ArmProfile>(await reader.ReadToEndAsync(cancellationToken));
        if (!parsed.Succeeded)
        {
            return Problems.Invalid(400, "The arm profile is not readable", parsed.Problems);
        }

        var report = ArmProfileValidator.Validate(parsed.Value);
        var problems = report.Problems.ToList();
        if (parsed.Value!.Id != armId)
        {
            problems.Add(ValidationProblem.Error("$.id", "armProfile.idMismatch", $"The profile's id '{parsed.Value.Id}' differs from the address '{armId}'."));
        }

        if (problems.Any(p => p.Severity == ProblemSeverity.Error))
        {
            return Problems.Invalid(422, "The arm profile is not valid", problems);
        }

        await store.PutArmProfileAsync(armId, OrchardJson.Serialize(parsed.Value), cancellationToken);
        return TypedResults.Ok(parsed.Value);
    }

    internal static async Task<IResult> GetArmProfile(string armId, IOrchardStore store, CancellationToken cancellationToken) =>
        await store.GetArmProfileAsync(armId, cancellationToken) is { } json
            ? TypedResults.Text(json, "application/json")
            : Problems.Of(404, "No such arm profile", $"No arm profile '{armId}'.");

    internal static async Task<Ok<IReadOnlyList<string>>> ListArmProfiles(IOrchardStore store, CancellationToken cancellationToken) =>
        TypedResults.Ok(await store.ListArmProfileIdsAsync(cancellationToken));

    internal static async Task<Results<Created<ApiKeyCreated>, ProblemHttpResult>> PostApiKey(ApiKeyRequest request, IOrchardStore store, TimeProvider clock, CancellationToken cancellationToken)
    {
        if (request?.Role is not { } role || !Roles.All.Contains(role))
        {
            return Problems.Of(422, "Unknown role", "role must be tablet, controller, manager or admin.", "$.role", "role.unknown");
        }

        var label = string.IsNullOrWhiteSpace(request.Label) ? role : request.Label.Trim();
        if (label.Length > 100)
        {
            return Problems.Of(422, "Label too long", "label must be at most 100 characters.", "$.label", "label.tooLong");
        }

        var secret = ApiKeySecrets.NewSecret();
        var keyId = "key-" + Guid.NewGuid().ToString("N")[..12];
        await store.AddApiKeyAsync(new ApiKeyRecord(keyId, role, ApiKeySecrets.HashHex(secret), label, clock.GetUtcNow()), cancellationToken);
        return TypedResults.Created($"/api/v1/api-keys/{keyId}", new ApiKeyCreated(keyId, role, label, secret));
    }
}
