using Orchard.Core.Reachability;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// A node of a stop's tour: the start (where the arm is when the stop begins; no cut) or one candidate
/// of one cut. Moves end and start at <see cref="Configuration"/>: the candidate's clear pose.
/// </summary>
/// <param name="Key">Names the node in the stop's move cache: <c>stow</c>, <c>at:{hash}</c>, or <c>c{cut}/{candidate}</c>.</param>
/// <param name="CutIndex">The cut, or −1 for the start.</param>
/// <param name="ServiceSeconds">Approach, cut and retract.</param>
internal sealed record TourNode(string Key, int CutIndex, CutCandidate? Candidate, double[] Configuration, double ServiceSeconds, double ApproachSeconds, IReadOnlyList<TrajectoryPoint> ApproachPoints);
