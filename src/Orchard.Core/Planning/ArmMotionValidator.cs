using Orchard.Core.Collision;

namespace Orchard.Core.Planning;

/// <summary>
/// The arm in its scene as a motion validator: configuration checks, conservative-advancement edge checks and
/// clearance from a <see cref="CollisionChecker"/>, in the arm's joint space.
/// </summary>
public sealed class ArmMotionValidator : IMotionValidator
{
    private readonly CollisionChecker _checker;

    public ArmMotionValidator(CollisionChecker checker)
    {
        _checker = checker ?? throw new ArgumentNullException(nameof(checker));
        Space = new JointConfigurationSpace(checker.Arm.Chain);
    }

    public IConfigurationSpace Space { get; }

    public long Checks => _checker.TotalChecks;

    public bool IsFree(ReadOnlySpan<double> q) => _checker.IsFree(q);

    public bool IsMotionFree(ReadOnlySpan<double> a, ReadOnlySpan<double> b) => _checker.IsEdgeFree(a, b);

    public double ClearanceM(ReadOnlySpan<double> q) => _checker.ClearanceM(q);
}
