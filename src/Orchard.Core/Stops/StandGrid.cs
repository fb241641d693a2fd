using Orchard.Core.Model;

namespace Orchard.Core.Stops;

/// <summary>
/// The stands the service may choose from around a tree, in order of preference: the near side before
/// the far side, then nearer the tablet's stand along the row, then the into-alley offsets in their
/// configured order. The far side mirrors the tablet's stand across the row line (y = 0), facing back.
/// </summary>
public static class StandGrid
{
    public static IReadOnlyList<Stand> Around(ArmBasePose hint, StopSearchSettings settings)
    {
        ArgumentNullException.ThrowIfNull(hint);
        ArgumentNullException.ThrowIfNull(settings);
        var alongSteps = settings.AlongRowStepM > 0 ? (int)Math.Floor((settings.AlongRowRangeM / settings.AlongRowStepM) + 1e-9) : 0;
        var along = Enumerable.Range(-alongSteps, (2 * alongSteps) + 1).Select(k => k * settings.AlongRowStepM)
            .OrderBy(Math.Abs).ThenBy(d => d).ToArray();
        var sides = settings.FarSide ? new[] { StopSide.Near, StopSide.Far } : [StopSide.Near];
        var stands = new List<Stand>();
        foreach (var side in sides)
        {
            foreach (var dx in along)
            {
                foreach (var dy in settings.IntoAlleyOffsetsM)
                {
                    stands.Add(Place(hint, side, dx, dy));
                }
            }
        }

        return stands;
    }

    /// <summary>The stand at these offsets from the tablet's stand (mirrored across the row for the far side).</summary>
    public static Stand Place(ArmBasePose hint, StopSide side, double alongRowOffsetM, double intoAlleyOffsetM)
    {
        ArgumentNullException.ThrowIfNull(hint);
        var p = hint.PositionM;
        var awayFromRow = p.Y >= 0 ? 1.0 : -1.0;
        var y = p.Y + (awayFromRow * intoAlleyOffsetM);
        var yaw = hint.YawRad;
        if (side == StopSide.Far)
        {
            y = -y;
            yaw = NormalizeAngle(yaw + Math.PI);
        }

        var pose = new ArmBasePose(new Vector3M(Math.Round(p.X + alongRowOffsetM, 6), Math.Round(y, 6), p.Z), Math.Round(yaw, 9));
        return new Stand(side, pose, alongRowOffsetM, intoAlleyOffsetM);
    }

    private static double NormalizeAngle(double a)
    {
        while (a > Math.PI)
        {
            a -= 2 * Math.PI;
        }

        while (a <= -Math.PI)
        {
            a += 2 * Math.PI;
        }

        return a;
    }
}
