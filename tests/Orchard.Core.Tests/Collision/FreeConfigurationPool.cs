using Orchard.Core.Collision;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Collision;

/// <summary>Free configurations of one work cell, drawn once from a seed: uniform ones and ones near the wood.</summary>
internal sealed class FreeConfigurationPool
{
    private FreeConfigurationPool(List<double[]> uniform, List<(double[] Q, int Limb)> nearWood)
    {
        Uniform = uniform;
        NearWood = nearWood;
    }

    /// <summary>Free configurations drawn uniformly within the limits.</summary>
    public IReadOnlyList<double[]> Uniform { get; }

    /// <summary>Free configurations with the shear close to a branch, and that branch's limb group.</summary>
    public IReadOnlyList<(double[] Q, int Limb)> NearWood { get; }

    /// <param name="nearWoodBases">Inverse-kinematics solutions to draw; each gives a few free perturbations of itself.</param>
    public static FreeConfigurationPool Create(WorkCell cell, CollisionChecker checker, DeterministicRandom random, int uniformCount, int nearWoodBases)
    {
        var uniform = new List<double[]>();
        while (uniform.Count < uniformCount)
        {
            var q = ConfigurationSampler.Uniform(random, cell.Chain);
            if (checker.IsFree(q))
            {
                uniform.Add(q);
            }
        }

        var nearWood = new List<(double[], int)>();
        if (nearWoodBases > 0)
        {
            var ik = new InverseKinematics(cell.Chain, ConfigurationSampler.NearWoodIk);
            for (int bases = 0, attempts = 0; bases < nearWoodBases; attempts++)
            {
                if (attempts > 4 * nearWoodBases)
                {
                    throw new InvalidOperationException($"Inverse kinematics found only {bases} near-wood configurations in {attempts} tries.");
                }

                if (!ConfigurationSampler.TryNearWood(cell, ik, random, out var solution, out var limb))
                {
                    continue;
                }

                bases++;
                for (var p = 0; p < 6; p++)
                {
                    var q = ConfigurationSampler.Perturbed(random, cell.Chain, solution, p < 3 ? 0.01 : 0.04);
                    if (checker.IsFree(q))
                    {
                        nearWood.Add((q, limb));
                    }
                }
            }
        }

        return new FreeConfigurationPool(uniform, nearWood);
    }
}
