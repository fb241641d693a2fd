using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Estimates;
using Microsoft.Extensions.Options;
using Orchard.Service.Auth;
using Orchard.Service.Hosting;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>Per-row, per-block and orchard job time estimates for the manager, as JSON and CSV.</summary>
public static class EstimatesApi
{
    public static RouteGroupBuilder MapEstimates(this RouteGroupBuilder api)
    {
        api.MapGet("/estimates", GetEstimates).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("Job time estimates: planned trees summed, the rest predicted, platform moves added.");
        api.MapGet("/estimates.csv", GetCsv).RequireAuthorization(p => p.RequireRole(Roles.Manager, Roles.Admin))
            .WithSummary("The same estimates as CSV.");
        return api;
    }

    internal static async Task<Ok<EstimatesView>> GetEstimates(IOrchardStore store, IOptions<OrchardOptions> options, double? manualSecondsPerTree, double? platformSpeedKmh, double? handSecondsPerCut, CancellationToken cancellationToken)
    {
        var (estimate, inputs) = await ComputeAsync(store, options.Value, manualSecondsPerTree, platformSpeedKmh, handSecondsPerCut, cancellationToken);
        return TypedResults.Ok(EstimatesView.From(estimate, inputs));
    }

    internal static async Task<IResult> GetCsv(IOrchardStore store, IOptions<OrchardOptions> options, double? manualSecondsPerTree, double? platformSpeedKmh, double? handSecondsPerCut, CancellationToken cancellationToken)
    {
        var (estimate, _) = await ComputeAsync(store, options.Value, manualSecondsPerTree, platformSpeedKmh, handSecondsPerCut, cancellationToken);
        return TypedResults.Text(EstimateCsv.Write(estimate), "text/csv; charset=utf-8");
    }

    /// <summary>The orchard's stored rates, each replaced by a query value when that is in range (a what-if that stores nothing).</summary>
    private static async Task<(OrchardEstimate Estimate, EstimateInputs Inputs)> ComputeAsync(
        IOrchardStore store, OrchardOptions options, double? manualSecondsPerTree, double? platformSpeedKmh, double? handSecondsPerCut, CancellationToken cancellationToken)
    {
        var cutTimeSettings = CutTimeFitSettings.Default with { MinimumCuts = Math.Max(3, options.MinimumMeasuredCutsPerBlock) };
        var inputs = await EstimateInputs.LoadAsync(store, cutTimeSettings, cancellationToken);
        var rates = inputs.Rates;
        rates = new ReferenceRates(
            manualSecondsPerTree is > 0 and <= ReferenceRates.MaxManualSecondsPerTree ? manualSecondsPerTree : rates.ManualSecondsPerTree,
            platformSpeedKmh is > 0 and <= ReferenceRates.MaxPlatformSpeedKmh ? platformSpeedKmh : rates.PlatformSpeedKmh,
            handSecondsPerCut is > 0 and <= ReferenceRates.MaxHandSecondsPerCut ? handSecondsPerCut : rates.HandSecondsPerCut);
        var settings = rates.ApplyTo(EstimateSettings.Default);
        return (EstimateCalculator.Compute(inputs.Trees, inputs.Rows, settings, inputs.CutTimes), inputs);
    }
}
