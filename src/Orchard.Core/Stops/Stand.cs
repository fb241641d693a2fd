using System.Globalization;
using System.Text.Json.Serialization;
using Orchard.Core.Model;

namespace Orchard.Core.Stops;

/// <summary>
/// A place the platform may stop at a tree: its side of the row, the arm base's pose in the tree frame,
/// and how far that is from the tablet's stand along the row and into the alley.
/// </summary>
/// <param name="AlongRowOffsetM">Offset from the tablet's stand along the row (tree frame x).</param>
/// <param name="IntoAlleyOffsetM">Offset from the stand line of its side, away from the row.</param>
public sealed record Stand(StopSide Side, ArmBasePose ArmBase, double AlongRowOffsetM, double IntoAlleyOffsetM)
{
    /// <summary>A stable name, for seeds and the move cache: side and offsets in millimetres.</summary>
    [JsonIgnore]
    public string Key => string.Create(CultureInfo.InvariantCulture, $"{(Side == StopSide.Near ? "near" : "far")}{Math.Round(AlongRowOffsetM * 1000):+0;-0;0}{Math.Round(IntoAlleyOffsetM * 1000):+0;-0;0}");
}
