namespace Orchard.Core.Collision;

/// <summary>
/// The full answer for one configuration: free or not (against the margins), the smallest distance
/// from the arm to anything (metres; negative is penetration), and what is closest or in contact.
/// </summary>
/// <param name="ArmLink">The arm link nearest to the closest thing (links 0..n−1, n the tool, n+1 the base); −1 when unknown.</param>
/// <param name="SceneCapsule">The closest scene capsule (an index into <see cref="Scene.Capsules"/>) when the closest thing is in the scene; else −1.</param>
/// <param name="OtherArmLink">For a self contact, the other link; else −1.</param>
public readonly record struct ConfigurationReport(bool IsFree, double ClearanceM, ContactKind Contact, int ArmLink = -1, int SceneCapsule = -1, int OtherArmLink = -1);
