namespace Orchard.Core.Estimates;

/// <summary>Estimate of one row.</summary>
public sealed record RowEstimate(string BlockId, string RowId, RowLayout Layout, EstimateTotals Totals);
