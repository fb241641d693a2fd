using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Estimates;
using Orchard.Service.Auth;
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

    internal static async Task<Ok<EstimatesView>> GetEstimates(IOrchardStore store, double? manualSecondsPerTree, double? platformSpeedKmh, CancellationToken cancellationToken)
    {
        var estimate = await ComputeAsync(store, manualSecondsPerTree, platformSpeedKmh, cancellationToken);
        return TypedResults.Ok(EstimatesView.From(estimate));
    }

    internal static async Task<IResult> GetCsv(IOrchardStore store, double? manualSecondsPerTree, double? platformSpeedKmh, CancellationToken cancellationToken)
    {
        var estimate = await ComputeAsync(store, manualSecondsPerTree, platformSpeedKmh, cancellationToken);
        return TypedResults.Text(EstimateCsv.Write(estimate), "text/csv; charset=utf-8");
    }

    private static async Task<OrchardEstimate> ComputeAsync(IOrchardStore store, double? manualSecondsPerTree, double? platformSpeedKmh, CancellationToken cancellationToken)
    {
        var (trees, rows) = await EstimateInputs.LoadAsync(store, cancellationToken);
        var settings = new EstimateSettings();
        if (manualSecondsPerTree is > 0 and < 100_000)
        {
            settings = settings with { ManualSecondsPerTree = manualSecondsPerTree.Value };
        }

        if (platformSpeedKmh is > 0 and < 100)
        {
            settings = settings with { PlatformSpeedKmh = platformSpeedKmh.Value };
        }

        return EstimateCalculator.Compute(trees, rows, settings);
    }
}
