namespace Orchard.Core.Estimates;

/// <summary>Estimate of one block: its rows and their totals (the interval recomputed over the whole block).</summary>
public sealed record BlockEstimate(string BlockId, IReadOnlyList<RowEstimate> Rows, EstimateTotals Totals);
