namespace Orchard.Core.Estimates;

/// <summary>Estimate of the orchard: blocks in layout order, the orchard totals, the time model used and the settings.</summary>
public sealed record OrchardEstimate(
    IReadOnlyList<BlockEstimate> Blocks,
    EstimateTotals Totals,
    TreeTimeModel Model,
    EstimateSettings Settings);
