namespace Orchard.Core.Sequencing.Tsplib;

/// <summary>A tour from a TSPLIB <c>.tour</c> file (the first one in its TOUR_SECTION); nodes 0-based.</summary>
/// <param name="Name">The file's NAME, e.g. <c>berlin52.opt.tour</c>.</param>
/// <param name="Nodes">The nodes in tour order, each once; TSPLIB's node k is k − 1 here.</param>
public sealed record TsplibTour(string Name, IReadOnlyList<int> Nodes);
