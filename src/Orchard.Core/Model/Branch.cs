namespace Orchard.Core.Model;

/// <summary>
/// A piece of wood between two nodes, drawn as a truncated cone. Branches point away from the root:
/// <see cref="FromNode"/> is the parent end (towards the trunk), <see cref="ToNode"/> the child end.
/// </summary>
public sealed record Branch(string Id, string FromNode, string ToNode, double FromRadiusM, double ToRadiusM);
