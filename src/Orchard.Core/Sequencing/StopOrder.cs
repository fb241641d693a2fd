namespace Orchard.Core.Sequencing;

/// <summary>One stop's tour: its nodes (the start first) and the order the solver chose (node indices, the start first).</summary>
internal sealed record StopOrder(IReadOnlyList<TourNode> Nodes, IReadOnlyList<int> Order, int Rounds);
