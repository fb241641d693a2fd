namespace Orchard.Service.Application;

/// <summary>Answer to a stored row registry: how many blocks and rows, and what is outside the usual ranges.</summary>
public sealed record RowsSaved(int Blocks, int Rows, IReadOnlyList<FieldProblem> Warnings);
