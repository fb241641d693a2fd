using Orchard.Core.Kinematics;

namespace Orchard.Core.Reachability;

/// <summary>How cut approaches are generated and checked. Defaults in brackets.</summary>
public sealed record ReachabilitySettings
{
    /// <summary>
    /// Approaches are perpendicular to the branch and turned about it by up to this angle either side of
    /// the direction facing the arm [60°].
    /// </summary>
    public double ApproachConeHalfAngleRad { get; init; } = Math.PI / 3;

    /// <summary>Approach directions tried across the cone, spread evenly, ends included [5].</summary>
    public int ApproachDirections { get; init; } = 5;

    /// <summary>Also try each approach with the shear turned half a turn about the approach (jaws the other way round) [true].</summary>
    public bool BothJawOrientations { get; init; } = true;

    /// <summary>Joint solutions kept per approach pose [2].</summary>
    public int SolutionsPerPose { get; init; } = 2;

    /// <summary>At most this many candidates per cut are kept, the clearest first [6].</summary>
    public int MaxCandidatesPerCut { get; init; } = 6;

    /// <summary>
    /// Stop trying further approach directions once this many candidates are found [8]; directions are
    /// tried from the one facing the arm outwards, so the kept ones face the arm most.
    /// </summary>
    public int EnoughCandidates { get; init; } = 8;

    /// <summary>The straight approach is followed through this many poses from pre-cut to cut [5].</summary>
    public int ApproachSteps { get; init; } = 5;

    /// <summary>
    /// Moves between cuts start and end this clear of the wood, trellis and ground [25 mm]: the approach is followed on out
    /// past the pre-cut pose until the arm has this much room, so the planners start outside the pocket
    /// the cut sits in. (On the demo orchard 25 mm and 0.1 m keep the coverage of 40 mm and 0.2 m and cut
    /// the arm's time per tree by a sixth: `bench coverage --clearance-target-mm --max-retreat-mm`.)
    /// </summary>
    public double ClearanceTargetM { get; init; } = 0.025;

    /// <summary>How far past the pre-cut pose the approach may be followed out for room [0.1 m].</summary>
    public double MaxRetreatM { get; init; } = 0.10;

    /// <summary>A re-plan starts by backing out at least this far along the shear's axis from where the arm was reported [40 mm].</summary>
    public double MinRetreatM { get; init; } = 0.04;

    /// <summary>Steps of that retreat [20 mm].</summary>
    public double RetreatStepM { get; init; } = 0.02;

    /// <summary>Largest joint change between two poses of the approach; more means the solution jumped [0.35 rad].</summary>
    public double MaxApproachJointStep { get; init; } = 0.35;

    /// <summary>Failing every pose, the shear's best miss farther than this counts as out of reach, nearer as joint limits [50 mm].</summary>
    public double OutOfReachMissM { get; init; } = 0.05;

    /// <summary>Inverse kinematics for the cut poses [2 random seeds beside the aimed one, at most 2 solutions].</summary>
    public InverseKinematicsSettings InverseKinematics { get; init; } = new(RandomSeedCount: 4, MaxSolutions: 2);

    public static ReachabilitySettings Default { get; } = new();
}
