using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>Pruning cut kinds, as the trade names them. Where the cut sits follows from the kind (see <c>CutPlacement</c>).</summary>
[JsonConverter(typeof(JsonStringEnumConverter<CutKind>))]
public enum CutKind
{
    /// <summary>Removes a branch where it joins its parent (everything beyond the cut goes); at <c>positionAlong</c>.</summary>
    [JsonStringEnumMemberName("thinning")] Thinning,

    /// <summary>Shortens a branch part way along it, to no side branch in particular; at <c>positionAlong</c>.</summary>
    [JsonStringEnumMemberName("heading")] Heading,

    /// <summary>
    /// Shortens a limb to a side branch that takes over as its end (a reduction cut): the cut sits on the
    /// branch being shortened just beyond the side branch named by <c>backToBranchId</c>, which grows from
    /// the same node.
    /// </summary>
    [JsonStringEnumMemberName("cutBack")] CutBack,

    /// <summary>
    /// Removes a branch but leaves a stub of <c>stubLengthM</c> outside its parent, whose buds grow a
    /// renewal shoot; the cut sits that far out from the parent's surface along the branch.
    /// </summary>
    [JsonStringEnumMemberName("renewal")] Renewal,
}
