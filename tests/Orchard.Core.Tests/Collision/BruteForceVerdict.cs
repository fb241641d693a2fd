using Orchard.Core.Collision;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// What <see cref="BruteForceChecker"/> finds for one configuration.
/// </summary>
/// <param name="WithinLimits">Every joint within its limits; when false nothing else is measured.</param>
/// <param name="IsFree">Within limits and every distance above its margin.</param>
/// <param name="ClearanceM">
/// The smallest distance from the arm to anything (scene signed distance, height above the ground, self and base
/// pairs), exact whenever it is below <see cref="CollisionSettings.DistanceCapM"/>; otherwise some value at or above it.
/// </param>
/// <param name="Closest">What that smallest distance is to.</param>
/// <param name="LeastRoomM">Smallest distance minus its margin over every check: free exactly when positive.</param>
/// <param name="KindGapM">How much farther the nearest thing of another kind is (+∞ when there is none).</param>
internal readonly record struct BruteForceVerdict(bool WithinLimits, bool IsFree, double ClearanceM, ContactKind Closest, double LeastRoomM, double KindGapM);
