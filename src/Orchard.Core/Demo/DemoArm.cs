using Orchard.Core.Model;

namespace Orchard.Core.Demo;

/// <summary>
/// The invented demo machine: a vertical lift carrying a generic 6-axis arm with a spherical wrist
/// and a bypass shear. The figures are plausible for a mid-size arm, not any maker's.
/// <para>
/// Base frame: on the platform deck, z up, x pointing at the tree row (the platform turns it to face
/// the row, see <see cref="DemoTreeGenerator"/>). At zero joint values the arm points straight up.
/// </para>
/// Sourcing of the numbers (common practice for mid-size arms unless marked): reach from the
/// shoulder to the TCP is 0.55 + 0.25 + 0.25 + 0.10 + 0.18 = 1.33 m; joint speeds 150–300 °/s and
/// accelerations 300–600 °/s² sit in the ranges the issue asks for (120–300 °/s, 100–600 °/s²); the
/// shear is rated for 20 mm wood, typical of powered bypass pruning shears (common practice).
/// </summary>
public static class DemoArm
{
    public const string Id = "demo-arm-l6";

    private static double Deg(double degrees) => degrees * Math.PI / 180.0;

    private static CapsuleSpec Capsule(double x0, double y0, double z0, double x1, double y1, double z1, double radiusM) =>
        new(new Vector3M(x0, y0, z0), new Vector3M(x1, y1, z1), radiusM);

    private static Joint Revolute(string name, double originZM, Vector3M axis, double limitDeg, double velocityDegS, double accelerationDegS2, params CapsuleSpec[] capsules) =>
        new(name, JointKind.Revolute, new Vector3M(0, 0, originZM), RotationRpyRad.Identity, axis,
            -Deg(limitDeg), Deg(limitDeg), Deg(velocityDegS), Deg(accelerationDegS2), capsules);

    /// <summary>Builds a fresh copy of the demo arm profile.</summary>
    public static ArmProfile Create()
    {
        var up = new Vector3M(0, 0, 1);
        var pitch = new Vector3M(0, 1, 0);
        var joints = new[]
        {
            // The lift: a carriage sliding up a mast, 0–2.0 m at 0.4 m/s and 0.8 m/s² (common practice for platform lifts).
            new Joint("lift", JointKind.Prismatic, Vector3M.Zero, RotationRpyRad.Identity, up,
                0.0, 2.0, 0.4, 0.8, [Capsule(-0.12, 0, 0.06, 0.06, 0, 0.06, 0.10)]),
            Revolute("turret", 0.15, up, 170, 180, 360, Capsule(0, 0, 0, 0, 0, 0.18, 0.09)),
            Revolute("shoulder", 0.20, pitch, 120, 150, 300, Capsule(0, 0, 0, 0, 0, 0.55, 0.065)),
            Revolute("elbow", 0.55, pitch, 150, 180, 360, Capsule(0, 0, 0, 0, 0, 0.25, 0.055)),
            Revolute("forearm-roll", 0.25, up, 180, 300, 600, Capsule(0, 0, 0.02, 0, 0, 0.21, 0.05)),
            Revolute("wrist-pitch", 0.25, pitch, 125, 300, 600, Capsule(0, 0, 0, 0, 0, 0.08, 0.045)),
            Revolute("flange-roll", 0.10, up, 180, 300, 600, Capsule(0, 0, 0, 0, 0, 0.03, 0.045)),
        };

        // Tool frame at the TCP: z out along the approach, branch along y, jaws close along x.
        // A motor body, a slim head (40 mm thick) behind the jaws, and two jaws 40 mm apart centre to
        // centre with 8 mm radius: a 24 mm mouth.
        var tool = new ShearTool(
            TcpOffsetM: new Vector3M(0, 0, 0.18),
            TcpRpyRad: RotationRpyRad.Identity,
            ShearCapsules:
            [
                Capsule(0, 0, -0.17, 0, 0, -0.10, 0.04),
                Capsule(0, 0, -0.09, 0, 0, -0.05, 0.02),
                Capsule(-0.02, 0, -0.04, -0.02, 0, 0.015, 0.008),
                Capsule(0.02, 0, -0.04, 0.02, 0, 0.015, 0.008),
            ],
            MaxCutDiameterMm: 20.0);

        return new ArmProfile(
            Id,
            "Demo lift-mounted 6-axis pruning arm (invented)",
            joints,
            // The lift mast behind the carriage, 2.6 m tall.
            BaseCapsules: [Capsule(-0.22, 0, 0, -0.22, 0, 2.6, 0.08)],
            Tool: tool,
            ApproachStandOffM: 0.08,
            // Lift down, arm folded over the deck facing the row, tool pointing down: compact and clear of the tree.
            StowConfiguration: [0.0, 0.0, 0.3, 2.4, 0.0, 0.6, 0.0],
            // 20 mm: 0.5 + 0.3 + 0.32 = 1.12 s (common practice for powered shears: about a second a cut).
            CutTime: new CutTimeModel(BaseSeconds: 0.5, SecondsPerMm: 0.015, SecondsPerMm2: 0.0008));
    }
}
