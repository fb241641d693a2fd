namespace Orchard.Core.Collision;

/// <summary>
/// The full answer for one configuration: free or not (against the margins), the smallest distance
/// from the arm to anything (metres; negative is penetration), and what is closest or in contact.
/// </summary>
public readonly record struct ConfigurationReport(bool IsFree, double ClearanceM, ContactKind Contact);
