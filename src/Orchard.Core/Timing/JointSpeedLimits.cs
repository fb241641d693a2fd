using Orchard.Core.Model;

namespace Orchard.Core.Timing;

/// <summary>Per-joint velocity and acceleration limits, in joint units (rad or m, per second and per second²).</summary>
public sealed class JointSpeedLimits
{
    public JointSpeedLimits(IReadOnlyList<double> maxVelocity, IReadOnlyList<double> maxAcceleration)
    {
        if (maxVelocity.Count != maxAcceleration.Count || maxVelocity.Count == 0)
        {
            throw new ArgumentException("One velocity and one acceleration limit per joint.", nameof(maxAcceleration));
        }

        if (maxVelocity.Concat(maxAcceleration).Any(v => !(v > 0) || !double.IsFinite(v)))
        {
            throw new ArgumentException("Limits must be finite and positive.", nameof(maxVelocity));
        }

        MaxVelocity = maxVelocity.ToArray();
        MaxAcceleration = maxAcceleration.ToArray();
    }

    public int JointCount => MaxVelocity.Length;

    public double[] MaxVelocity { get; }

    public double[] MaxAcceleration { get; }

    public static JointSpeedLimits From(ArmProfile arm)
    {
        ArgumentNullException.ThrowIfNull(arm);
        return new JointSpeedLimits(arm.Joints.Select(j => j.MaxVelocity).ToArray(), arm.Joints.Select(j => j.MaxAcceleration).ToArray());
    }
}
