using System.Security.Claims;
using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Model;
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
        admin.MapPut("/arm-profiles/{armId}", PutArmProfile).Accepts<ArmProfile>("application/json")
            .Produces<ArmProfile>().ProducesProblem(StatusCodes.Status400BadRequest).ProducesProblem(StatusCodes.Status422UnprocessableEntity)
            .WithSummary("Register or replace an arm profile.");
        admin.MapGet("/arm-profiles/{armId}", GetArmProfile).WithSummary("An arm profile.");
        admin.MapGet("/arm-profiles", ListArmProfiles).WithSummary("Registered arm profile ids.");
        admin.MapPost("/api-keys", PostApiKey).Accepts<ApiKeyRequest>("application/json")
            .Produces<ApiKeyCreated>(StatusCodes.Status201Created).ProducesProblem(StatusCodes.Status422UnprocessableEntity)
            .WithSummary("Make an API key (optionally with an expiry); its secret is shown once.");
        admin.MapGet("/api-keys", ListApiKeys).WithSummary("Every API key with its role, expiry, revocation and last use (never the secret).");
        admin.MapDelete("/api-keys/{keyId}", RevokeApiKey).Produces(StatusCodes.Status204NoContent).ProducesProblem(StatusCodes.Status404NotFound).ProducesProblem(StatusCodes.Status409Conflict)
            .WithSummary("Revoke an API key; its review sessions end with it. The last usable admin key cannot be revoked.");
        admin.MapGet("/audit", ListAudit).WithSummary("The audit trail, newest first: which key posted, re-planned, revoked or changed what.");
        return api;
    }

    internal static async Task<IResult> PutArmProfile(string armId, JsonBody body, ClaimsPrincipal user, ArmProfiles profiles, CancellationToken cancellationToken) =>
        Answers.From(await profiles.PutAsync(armId, body.Utf8, Caller.Of(user), cancellationToken));

    internal static async Task<IResult> GetArmProfile(string armId, IOrchardStore store, CancellationToken cancellationToken) =>
        await store.GetArmProfileAsync(armId, cancellationToken) is { } json
            ? TypedResults.Text(json, "application/json")
            : Problems.Of(404, "No such arm profile", $"No arm profile '{armId}'.");

    internal static async Task<Ok<IReadOnlyList<string>>> ListArmProfiles(IOrchardStore store, CancellationToken cancellationToken) =>
        TypedResults.Ok(await store.ListArmProfileIdsAsync(cancellationToken));

    internal static async Task<IResult> PostApiKey(JsonBody body, ClaimsPrincipal user, KeyManagement keys, CancellationToken cancellationToken) =>
        Answers.From(await keys.CreateAsync(body.Utf8, Caller.Of(user), cancellationToken));

    internal static async Task<Ok<IReadOnlyList<ApiKeyView>>> ListApiKeys(KeyManagement keys, CancellationToken cancellationToken) =>
        TypedResults.Ok(await keys.ListAsync(cancellationToken));

    internal static async Task<IResult> RevokeApiKey(string keyId, ClaimsPrincipal user, KeyManagement keys, CancellationToken cancellationToken) =>
        Answers.From(await keys.RevokeAsync(keyId, Caller.Of(user), cancellationToken));

    internal static async Task<Ok<IReadOnlyList<AuditView>>> ListAudit(int? limit, KeyManagement keys, CancellationToken cancellationToken) =>
        TypedResults.Ok(await keys.AuditAsync(limit, cancellationToken));
}
