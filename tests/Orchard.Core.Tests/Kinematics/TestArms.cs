using Orchard.Core.Model;

namespace Orchard.Core.Tests.Kinematics;

/// <summary>Reference arms for the kinematics tests, built as <see cref="ArmProfile"/>s in the URDF convention.</summary>
internal static class TestArms
{
    /// <summary>
    /// PUMA 560 link lengths in metres, as commonly quoted for the arm (a₂ = 431.8 mm, a₃ = 20.32 mm,
    /// d₃ = 149.09 mm, d₄ = 433.07 mm; recalled from memory). The closed-form checks hold for any values,
    /// so the exactness of these figures does not matter to them.
    /// </summary>
    public const double PumaA2 = 0.4318;
    public const double PumaA3 = 0.02032;
    public const double PumaD3 = 0.14909;
    public const double PumaD4 = 0.43307;

    /// <summary>
    /// The PUMA 560 link parameters of Craig, "Introduction to Robotics: Mechanics and Control", 3rd ed.
    /// (2005), §3.7 (the link-parameter table of the PUMA 560; table recalled from memory), modified
    /// Denavit–Hartenberg: rows (α_{i−1}, a_{i−1}, d_i), θ_i the joint variable.
    /// </summary>
    public static readonly (double AlphaPrev, double APrev, double D)[] PumaModifiedDh =
    [
        (0, 0, 0),
        (-Math.PI / 2, 0, 0),
        (0, PumaA2, PumaD3),
        (-Math.PI / 2, PumaA3, PumaD4),
        (Math.PI / 2, 0, 0),
        (-Math.PI / 2, 0, 0),
    ];

    /// <summary>
    /// The PUMA 560 as an ArmProfile. A modified-DH link maps exactly onto a URDF joint:
    /// RotX(α) TransX(a) TransZ(d) RotZ(θ) = Trans(a, −d sin α, d cos α) · RotX(α) · RotZ(θ), so the joint
    /// origin is (a_{i−1}, −d_i sin α_{i−1}, d_i cos α_{i−1}), its rpy (α_{i−1}, 0, 0), its axis z.
    /// The TCP is frame 6 itself.
    /// </summary>
    public static ArmProfile Puma560()
    {
        var joints = new List<Joint>();
        for (var i = 0; i < PumaModifiedDh.Length; i++)
        {
            var (alpha, a, d) = PumaModifiedDh[i];
            joints.Add(Revolute(
                $"joint{i + 1}",
                new Vector3M(a, -d * Math.Sin(alpha), d * Math.Cos(alpha)),
                new RotationRpyRad(alpha, 0, 0),
                new Vector3M(0, 0, 1),
                Math.PI));
        }

        return Profile("puma560", joints, Vector3M.Zero);
    }

    /// <summary>A planar two-link (2R) arm in the base x–y plane: link lengths a₁, a₂, both axes along z.</summary>
    public static ArmProfile Planar2R(double a1, double a2) => Profile(
        "planar-2r",
        [
            Revolute("joint1", Vector3M.Zero, RotationRpyRad.Identity, new Vector3M(0, 0, 1), Math.PI),
            Revolute("joint2", new Vector3M(a1, 0, 0), RotationRpyRad.Identity, new Vector3M(0, 0, 1), Math.PI),
        ],
        new Vector3M(a2, 0, 0));

    private static Joint Revolute(string name, Vector3M origin, RotationRpyRad rpy, Vector3M axis, double limit) =>
        new(name, JointKind.Revolute, origin, rpy, axis, -limit, limit, 1.0, 1.0, []);

    private static ArmProfile Profile(string id, List<Joint> joints, Vector3M tcpOffset) => new(
        id,
        id,
        joints,
        [],
        new ShearTool(tcpOffset, RotationRpyRad.Identity, [], 20.0),
        0.05,
        new double[joints.Count],
        new CutTimeModel(0.5, 0.0, 0.0));
}
