using System.Security.Claims;
using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Service.Application;
using Orchard.Service.Auth;

namespace Orchard.Service.Api;

/// <summary>
/// The orchard's row registry (an admin writes it, the manager reads it) and its reference rates (the
/// manager keeps them): what the estimates are computed from besides the trees. The review page saves
/// rates through its own form endpoint (<c>POST /review/rates</c>), since its cookie makes no API writes.
/// </summary>
public static class RowsApi
{
    public static RouteGroupBuilder MapRows(this RouteGroupBuilder api)
    {
        api.MapPut("/rows", PutRows).RequireAuthorization(p => p.RequireRole(Roles.Admin)).Accepts<RowRegistry>("application/json")
            .WithSummary("Register the orchard's blocks and rows (replaces the registry): length, tree spacing, row spacing, alley width, sides.");
        api.MapGet("/rows", GetRows).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("The row registry.");
        api.MapPut("/rates", PutRates).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin)).Accepts<ReferenceRates>("application/json")
            .WithSummary("Keep the orchard's reference rates: hand pruning per tree, platform speed, hand follow-up per cut (rates left out keep their value).");
        api.MapGet("/rates", GetRates).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("The orchard's reference rates, defaults filled in.");
        return api;
    }

    internal static async Task<IResult> PutRows(JsonBody body, ClaimsPrincipal user, OrchardSetup setup, CancellationToken cancellationToken) =>
        Answers.From(await setup.PutRowsAsync(body.Utf8, Caller.Of(user), cancellationToken));

    internal static async Task<Ok<RowRegistry>> GetRows(OrchardSetup setup, CancellationToken cancellationToken) =>
        TypedResults.Ok(await setup.RowsAsync(cancellationToken));

    internal static async Task<IResult> PutRates(JsonBody body, ClaimsPrincipal user, OrchardSetup setup, CancellationToken cancellationToken) =>
        Answers.From(await setup.PutRatesAsync(body.Utf8, Caller.Of(user), cancellationToken));

    internal static async Task<Ok<ReferenceRates>> GetRates(OrchardSetup setup, CancellationToken cancellationToken) =>
        TypedResults.Ok(await setup.RatesAsync(cancellationToken));
}
