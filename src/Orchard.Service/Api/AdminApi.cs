using System.Security.Claims;
using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using ValidationProblem = Orchard.Core.Validation.ValidationProblem;
using Orchard.Service.Application;
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
        admin.MapPost("/api-keys", PostApiKey).Accepts<ApiKeyRequest>("application/json").WithSummary("Make an API key; its secret is shown once.");
        return api;
    }

    internal static async Task<Results<Ok<ArmProfile>, ProblemHttpResult>> PutArmProfile(string armId, JsonBody body, ClaimsPrincipal user, IOrchardStore store, CancellationToken cancellationToken)
    {
        var (profile, unreadable) = DocumentReader.Read<ArmProfile>(body.Utf8);
        if (profile is null)
        {
            return Problems.Invalid(400, "The arm profile is not readable", unreadable);
        }

        var report = ArmProfileValidator.Validate(profile);
        var problems = report.Problems.ToList();
        if (profile.Id != armId)
        {
            problems.Add(ValidationProblem.Error("$.id", "armProfile.idMismatch", $"The profile's id '{profile.Id}' differs from the address '{armId}'."));
        }

        if (problems.Any(p => p.Severity == ProblemSeverity.Error))
        {
            return Problems.Invalid(422, "The arm profile is not valid", problems);
        }

        await store.PutArmProfileAsync(armId, OrchardJson.Serialize(profile), Caller.Of(user).KeyId, cancellationToken);
        return TypedResults.Ok(profile);
    }

    internal static async Task<IResult> GetArmProfile(string armId, IOrchardStore store, CancellationToken cancellationToken) =>
        await store.GetArmProfileAsync(armId, cancellationToken) is { } json
            ? TypedResults.Text(json, "application/json")
            : Problems.Of(404, "No such arm profile", $"No arm profile '{armId}'.");

    internal static async Task<Ok<IReadOnlyList<string>>> ListArmProfiles(IOrchardStore store, CancellationToken cancellationToken) =>
        TypedResults.Ok(await store.ListArmProfileIdsAsync(cancellationToken));

    internal static async Task<Results<Created<ApiKeyCreated>, ProblemHttpResult>> PostApiKey(JsonBody body, ClaimsPrincipal user, IOrchardStore store, TimeProvider clock, CancellationToken cancellationToken)
    {
        var (request, unreadable) = DocumentReader.Read<ApiKeyRequest>(body.Utf8);
        if (request is null)
        {
            return Problems.Invalid(400, "The key request is not readable", unreadable);
        }

        if (request.Role is not { } role || !Roles.All.Contains(role))
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
        await store.AddApiKeyAsync(new ApiKeyRecord(keyId, role, ApiKeySecrets.HashHex(secret), label, clock.GetUtcNow()) { ExpiresAt = request.ExpiresAt }, Caller.Of(user).KeyId, cancellationToken);
        return TypedResults.Created($"/api/v1/api-keys/{keyId}", new ApiKeyCreated(keyId, role, label, secret, request.ExpiresAt));
    }
}
