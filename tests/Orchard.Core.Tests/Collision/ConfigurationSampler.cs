using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;
using Orchard.Core.Reachability;

namespace Orchard.Core.Tests.Collision;

/// <summary>Seeded sources of test configurations: uniform within the limits, and near the wood of a tree.</summary>
internal static class ConfigurationSampler
{
    /// <summary>Inverse kinematics for the near-wood samples: the aimed seed, one random seed, the first solution.</summary>
    public static readonly InverseKinematicsSettings NearWoodIk = new(RandomSeedCount: 1, MaxSolutions: 1);

    public static double[] Uniform(DeterministicRandom random, KinematicChain chain)
    {
        var q = new double[chain.JointCount];
        for (var j = 0; j < q.Length; j++)
        {
            q[j] = random.NextDouble(chain.LowerLimits[j], chain.UpperLimits[j]);
        }

        return q;
    }

    /// <summary>q plus a Gaussian step of <paramref name="sigma"/> per joint (joint units), clamped into the limits.</summary>
    public static double[] Perturbed(DeterministicRandom random, KinematicChain chain, IReadOnlyList<double> q, double sigma)
    {
        var p = new double[q.Count];
        for (var j = 0; j < p.Length; j++)
        {
            p[j] = Math.Clamp(q[j] + (sigma * random.NextGaussian()), chain.LowerLimits[j], chain.UpperLimits[j]);
        }

        return p;
    }

    /// <summary>
    /// A configuration with the shear at a random point of a random branch of the cell's tree (backed off along the
    /// approach by −3 to +20 cm, turned up to 75° about the branch from the direction facing the arm, either jaw
    /// orientation), by inverse kinematics; false when the solver finds none. <paramref name="limb"/> is the branch's
    /// limb group.
    /// </summary>
    public static bool TryNearWood(WorkCell cell, InverseKinematics ik, DeterministicRandom random, out double[] q, out int limb)
    {
        var scan = cell.Scan;
        var branch = random.NextInt(scan.Branches.Count);
        limb = cell.Scene.LimbOfBranch[branch];
        var (point, axis) = ReachabilityAnalyzer.CutPointAndAxis(scan, branch, random.NextDouble(0.05, 0.95));
        var facing = CutPoses.FacingApproach(point, axis, cell.BasePositionM);
        var pose = CutPoses.ShearPose(point, axis, facing, random.NextDouble(-1.3, 1.3), random.NextBool(0.5));
        pose = CutPoses.BackedOff(pose, random.NextDouble(-0.03, 0.2));
        var result = ik.Solve(pose, AimedSeed(cell, point), random);
        q = result.Found ? result.Solutions[0].Joints.ToArray() : [];
        return result.Found;
    }

    /// <summary>The stow configuration with the lift at the target's height and the turret facing it (demo arm layout).</summary>
    public static double[] AimedSeed(WorkCell cell, in Vec3 target)
    {
        var chain = cell.Chain;
        var seed = cell.Profile.StowConfiguration.ToArray();
        var inBase = chain.BaseInRoot.Inverse().TransformPoint(target);

        // The shoulder stands 0.35 m above the base frame at lift 0 (demo arm: turret 0.15 m, shoulder 0.20 m above it).
        seed[0] = Math.Clamp(inBase.Z - 0.35, chain.LowerLimits[0], chain.UpperLimits[0]);
        seed[1] = Math.Clamp(Math.Atan2(inBase.Y, inBase.X), chain.LowerLimits[1], chain.UpperLimits[1]);
        return seed;
    }
}
