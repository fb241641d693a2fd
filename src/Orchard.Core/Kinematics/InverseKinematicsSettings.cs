namespace Orchard.Core.Kinematics;

/// <summary>
/// Settings of <see cref="InverseKinematics"/>: damped least squares (Levenberg–Marquardt) from several seeds.
/// Joint-space quantities are in joint units (rad for revolute joints, m for prismatic ones) and mixed
/// as they are, without scaling.
/// </summary>
/// <param name="MaxIterations">Damped least-squares steps per seed, accepted or rejected. Default 100.</param>
/// <param name="Damping">
/// The damping factor λ of the step Δq = Jᵀ (J Jᵀ + λ² I)⁻¹ e, and the starting value when it adapts.
/// Larger is steadier near singularities, smaller converges faster. Default 0.05 (error units: m).
/// </param>
/// <param name="AdaptiveDamping">
/// Adapt λ as Levenberg–Marquardt does: a step that lowers the weighted error is kept and λ shrinks by
/// <see cref="DampingDecrease"/>; one that does not is discarded and λ grows by <see cref="DampingIncrease"/>.
/// When false, every step is kept and λ stays at <see cref="Damping"/>. Default true.
/// </param>
/// <param name="MinDamping">Floor of the adapted λ. Default 1e-5.</param>
/// <param name="MaxDamping">Ceiling of the adapted λ; a seed whose λ would pass it is given up as stuck. Default 10.</param>
/// <param name="DampingDecrease">Factor on λ after a kept step, in (0, 1]. Default 0.3.</param>
/// <param name="DampingIncrease">Factor on λ after a discarded step, &gt; 1. Default 4.</param>
/// <param name="MaxStepNorm">Cap on the Euclidean norm of one joint step, joint units; longer steps are scaled down. Default 1.0.</param>
/// <param name="PositionToleranceM">A solution's TCP is at most this far from the target, metres. Default 1e-4 (0.1 mm).</param>
/// <param name="OrientationToleranceRad">A solution's TCP orientation is at most this angle from the target, radians. Default 1e-3 (1 mrad).</param>
/// <param name="RandomSeedCount">
/// Random seeds, uniform within the joint limits, tried after the caller's seeds. Default 8.
/// </param>
/// <param name="DistinctnessThreshold">
/// Two solutions closer than this Euclidean joint-space distance (joint units, revolute values taken
/// as they are, not wrapped, so two rolls 2π apart are distinct) count as one; the first found is kept. Default 0.1.
/// </param>
/// <param name="OrientationWeightM">
/// Metres of position error one radian of orientation error counts as in the least-squares objective
/// (the angular rows of the error and the Jacobian are scaled by it). Does not change the tolerances. Default 0.3.
/// </param>
/// <param name="MaxSolutions">Stop trying seeds once this many distinct solutions are found; null for no limit. Default null.</param>
public sealed record InverseKinematicsSettings(
    int MaxIterations = 100,
    double Damping = 0.05,
    bool AdaptiveDamping = true,
    double MinDamping = 1e-5,
    double MaxDamping = 10.0,
    double DampingDecrease = 0.3,
    double DampingIncrease = 4.0,
    double MaxStepNorm = 1.0,
    double PositionToleranceM = 1e-4,
    double OrientationToleranceRad = 1e-3,
    int RandomSeedCount = 8,
    double DistinctnessThreshold = 0.1,
    double OrientationWeightM = 0.3,
    int? MaxSolutions = null)
{
    /// <summary>The defaults listed above.</summary>
    public static InverseKinematicsSettings Default { get; } = new();

    /// <summary>Throws when a setting is out of its range.</summary>
    /// <exception cref="ArgumentOutOfRangeException">A setting is out of range.</exception>
    public void Validate()
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(MaxIterations);
        RequirePositive(Damping, nameof(Damping));
        RequirePositive(MinDamping, nameof(MinDamping));
        RequirePositive(MaxDamping, nameof(MaxDamping));
        if (MinDamping > MaxDamping)
        {
            throw new ArgumentOutOfRangeException(nameof(MinDamping), MinDamping, "MinDamping exceeds MaxDamping.");
        }

        if (!(DampingDecrease > 0 && DampingDecrease <= 1))
        {
            throw new ArgumentOutOfRangeException(nameof(DampingDecrease), DampingDecrease, "Must be in (0, 1].");
        }

        if (!(DampingIncrease > 1 && double.IsFinite(DampingIncrease)))
        {
            throw new ArgumentOutOfRangeException(nameof(DampingIncrease), DampingIncrease, "Must be finite and > 1.");
        }

        RequirePositive(MaxStepNorm, nameof(MaxStepNorm));
        RequirePositive(PositionToleranceM, nameof(PositionToleranceM));
        RequirePositive(OrientationToleranceRad, nameof(OrientationToleranceRad));
        ArgumentOutOfRangeException.ThrowIfNegative(RandomSeedCount);
        if (!(DistinctnessThreshold >= 0 && double.IsFinite(DistinctnessThreshold)))
        {
            throw new ArgumentOutOfRangeException(nameof(DistinctnessThreshold), DistinctnessThreshold, "Must be finite and ≥ 0.");
        }

        RequirePositive(OrientationWeightM, nameof(OrientationWeightM));
        if (MaxSolutions is { } max)
        {
            ArgumentOutOfRangeException.ThrowIfNegativeOrZero(max, nameof(MaxSolutions));
        }
    }

    private static void RequirePositive(double value, string name)
    {
        if (!(value > 0 && double.IsFinite(value)))
        {
            throw new ArgumentOutOfRangeException(name, value, "Must be finite and > 0.");
        }
    }
}
