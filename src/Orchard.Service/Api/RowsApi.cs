using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>
/// The orchard's row registry (an admin writes it, the manager reads it) and its reference rates (the
/// manager keeps them): what the estimates are computed from besides the trees.
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
            .WithSummary("Keep the orchard's reference rates: hand pruning per tree, platform speed, hand follow-up per cut.");
        api.MapGet("/rates", GetRates).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("The orchard's reference rates, defaults filled in.");
        return api;
    }

    internal static async Task<Results<Ok<RowsSaved>, ProblemHttpResult>> PutRows(HttpRequest request, IOrchardStore store, CancellationToken cancellationToken)
    {
        using var reader = new StreamReader(request.Body);
        var parsed = OrchardJson.Parse<RowRegistry>(await reader.ReadToEndAsync(cancellationToken));
        if (!parsed.Succeeded)
        {
            return Problems.Invalid(400, "The row registry is not readable", parsed.Problems);
        }

        var report = RowRegistryValidator.Validate(parsed.Value);
        if (!report.IsValid)
        {
            return Problems.Invalid(422, "The row registry is not valid", report.Problems);
        }

        var registry = parsed.Value!;
        await store.PutOrchardDocumentAsync(OrchardDocuments.Rows, OrchardJson.Serialize(registry), cancellationToken);
        return TypedResults.Ok(new RowsSaved(
            registry.Blocks.Count,
            registry.Blocks.Sum(b => b.Rows.Count),
            report.Warnings.Select(w => new ProblemItem(w.Path, w.Code, w.Message)).ToArray()));
    }

    internal static async Task<Ok<RowRegistry>> GetRows(IOrchardStore store, CancellationToken cancellationToken) =>
        TypedResults.Ok(await OrchardDocuments.RowsAsync(store, cancellationToken));

    internal static async Task<Results<Ok<ReferenceRates>, ProblemHttpResult>> PutRates(HttpRequest request, IOrchardStore store, CancellationToken cancellationToken)
    {
        using var reader = new StreamReader(request.Body);
        var parsed = OrchardJson.Parse<ReferenceRates>(await reader.ReadToEndAsync(cancellationToken));
        if (!parsed.Succeeded)
        {
            return Problems.Invalid(400, "The reference rates are not readable", parsed.Problems);
        }

        var report = ReferenceRatesValidator.Validate(parsed.Value);
        if (!report.IsValid)
        {
            return Problems.Invalid(422, "The reference rates are not valid", report.Problems);
        }

        // Rates left out keep their stored value.
        var stored = await OrchardDocuments.RatesAsync(store, cancellationToken);
        var given = parsed.Value!;
        var merged = new ReferenceRates(
            given.ManualSecondsPerTree ?? stored.ManualSecondsPerTree,
            given.PlatformSpeedKmh ?? stored.PlatformSpeedKmh,
            given.HandSecondsPerCut ?? stored.HandSecondsPerCut);
        await store.PutOrchardDocumentAsync(OrchardDocuments.Rates, OrchardJson.Serialize(merged), cancellationToken);
        return TypedResults.Ok(ReferenceRates.Of(merged.ApplyTo(EstimateSettings.Default)));
    }

    internal static async Task<Ok<ReferenceRates>> GetRates(IOrchardStore store, CancellationToken cancellationToken) =>
        TypedResults.Ok(ReferenceRates.Of((await OrchardDocuments.RatesAsync(store, cancellationToken)).ApplyTo(EstimateSettings.Default)));
}
