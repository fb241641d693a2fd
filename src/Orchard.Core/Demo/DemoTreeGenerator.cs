using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Randomness;
using Orchard.Core.Reachability;

namespace Orchard.Core.Demo;

/// <summary>
/// Grows one invented tall-spindle tree on a trellis and marks its dormant-pruning cuts. Every random
/// draw comes from a stream of its own (seed, tree number), so one tree never changes another.
/// <para>
/// Ranges and where they come from. Tall-spindle trees stand about 3–3.7 m tall (the range the issue
/// gives, which matches tall-spindle guidance of tree height ≈ 0.9 × row spacing; common practice).
/// Trunk diameters of 38–55 mm near the ground for established trees, tapering to under 10 mm at the
/// leader's tip; feathered laterals start at about 0.7 m and come every 5–16 cm up the leader; lower
/// laterals are the longest (a cone shape, about 0.8 m falling to 0.25 m at the top): all common
/// practice for tall-spindle apple, not taken from one source.
/// </para>
/// </summary>
public static class DemoTreeGenerator
{
    /// <summary>Where the demo's scan time starts: a January morning, when dormant pruning is done.</summary>
    private static readonly DateTimeOffset FirstScan = new(2026, 1, 12, 7, 30, 0, TimeSpan.Zero);

    /// <summary>The arm base stands this far into the aisle from the row line (tree frame y), metres.</summary>
    public const double StandOffRowM = 0.95;

    /// <summary>Height of the platform deck the lift stands on, metres.</summary>
    public const double DeckHeightM = 0.40;

    /// <summary>
    /// The canopy is hedged to keep this much room around the stowed demo arm at the tablet's stand [0.10 m]:
    /// a shoot that would grow nearer is shorter, as the grower's hedging left it (common practice: trellised
    /// rows are hedged so machines pass down the alley).
    /// </summary>
    public const double HedgeClearanceM = 0.10;

    public static TreeScan Generate(DemoRow row, int positionInRow, ulong seed, ulong stream)
    {
        ArgumentNullException.ThrowIfNull(row);
        var rng = DeterministicRandom.ForStream(seed, stream);

        // Where the tablet's stand is comes from a stream of its own, so the wood is the same whatever is drawn for it.
        var standRng = DeterministicRandom.ForStream(seed ^ 0x5A4D_D0C4_57A4_D001UL, stream);
        var armBase = new ArmBasePose(
            new Vector3M(TreeWood.RoundM(standRng.NextDouble(-0.05, 0.05)), TreeWood.RoundM(StandOffRowM + standRng.NextDouble(-0.04, 0.04)), DeckHeightM),
            Math.Round((-Math.PI / 2) + standRng.NextDouble(-0.03, 0.03), 5));
        var hedge = new StowedArmEnvelope(DemoArm.Create(), armBase);
        var wood = new TreeWood();
        var heightM = rng.NextDouble(3.0, 3.55);
        var trunkDiameterMm = rng.NextDouble(38, 55);
        const double tipDiameterMm = 8.0;
        var leanX = rng.NextGaussian() * 0.04;
        var leanY = rng.NextGaussian() * 0.03;

        double LeaderDiameterMm(double z) => trunkDiameterMm + ((tipDiameterMm - trunkDiameterMm) * Math.Clamp(z / heightM, 0, 1));
        Vec3 LeaderAt(double z, double wobbleX, double wobbleY)
        {
            var f = z / heightM;
            return new Vec3((leanX * f * f) + wobbleX, (leanY * f * f) + wobbleY, z);
        }

        // Lateral attachment heights up the leader.
        var attachHeights = new List<double>();
        for (var z = rng.NextDouble(0.65, 0.8); z < heightM - 0.25; z += rng.NextDouble(0.05, 0.16))
        {
            attachHeights.Add(z);
        }

        // The leader: a chain of branches through every attachment height, no piece longer than 0.3 m.
        var leaderHeights = new List<double> { 0.0 };
        foreach (var z in attachHeights.Append(heightM))
        {
            var last = leaderHeights[^1];
            var pieces = (int)Math.Ceiling((z - last) / 0.3);
            for (var k = 1; k <= pieces; k++)
            {
                leaderHeights.Add(k == pieces ? z : last + ((z - last) * k / pieces));
            }
        }

        var leader = new Limb(LimbKind.Leader, null, 0, 0, trunkDiameterMm, trunkDiameterMm);
        var leaderNodeAt = new Dictionary<double, int>();
        var previous = wood.AddNode(Vec3.Zero);
        leaderNodeAt[0.0] = previous;
        for (var i = 1; i < leaderHeights.Count; i++)
        {
            var z = leaderHeights[i];
            var node = wood.AddNode(LeaderAt(z, rng.NextGaussian() * 0.006, rng.NextGaussian() * 0.006));
            var branch = wood.AddBranch(previous, node, LeaderDiameterMm(leaderHeights[i - 1]) / 2000, LeaderDiameterMm(z) / 2000);
            leader.Branches.Add(branch);
            leader.SegmentLengthsM.Add(Vec3.Distance(wood.Positions[previous], wood.Positions[node]));
            leaderNodeAt[z] = node;
            previous = node;
        }

        foreach (var z in attachHeights)
        {
            leader.Children.Add(GrowLateral(wood, rng, hedge, leader, leaderNodeAt[z], z, heightM, LeaderDiameterMm(z)));
        }

        var cuts = PruningRules.MarkCuts(wood, leader, heightM, PruningRuleSettings.Default);
        var obstacles = TrellisLayout.ObstaclesNear(row, positionInRow);

        var scan = new TreeScan(
            TreeId: $"{row.Name}-{positionInRow:D3}",
            Block: row.Block,
            Row: row.Name,
            PositionInRow: positionInRow,
            ScannedAt: FirstScan.AddMinutes(3 * (double)stream),
            ArmBase: armBase,
            Nodes: wood.Nodes.ToArray(),
            Branches: wood.Branches.ToArray(),
            Obstacles: obstacles,
            Cuts: cuts);

        // A renewal cut's positionAlong states where its kind puts it, measured on the scan's own (rounded) wood.
        return scan with
        {
            Cuts = cuts.Select(c => c.Kind == CutKind.Renewal ? c with { PositionAlong = CutPlacement.PositionAlong(scan, c) } : c).ToArray(),
        };
    }

    /// <summary>
    /// The length a shoot keeps after hedging: as grown when every piece stays <see cref="HedgeClearanceM"/>
    /// from the stowed arm, else shortened a tenth at a time until it does (never below 5 cm).
    /// </summary>
    private static double Hedged(StowedArmEnvelope hedge, Vec3 start, Vec3[] directions, double lengthM, double radiusM)
    {
        bool Clear(double length)
        {
            var at = start;
            foreach (var d in directions)
            {
                var next = at + (d * (length / directions.Length));
                if (hedge.ClearanceM(at, next, radiusM) < HedgeClearanceM)
                {
                    return false;
                }

                at = next;
            }

            return true;
        }

        while (lengthM > 0.05 && !Clear(lengthM))
        {
            lengthM = Math.Max(0.05, lengthM * 0.9);
        }

        return lengthM;
    }

    /// <summary>The cone of the spindle: how long a lateral may be at a height, metres (common practice).</summary>
    internal static double AllowedLateralLengthM(double attachHeightM, double treeHeightM)
    {
        var f = Math.Clamp((attachHeightM - 0.7) / Math.Max(0.1, treeHeightM - 0.7), 0, 1);
        return 0.25 + (0.55 * (1 - f));
    }

    private static Limb GrowLateral(TreeWood wood, DeterministicRandom rng, StowedArmEnvelope hedge, Limb leader, int attachNode, double z, double heightM, double leaderDiameterMm)
    {
        // Most laterals grow along the row (a narrow fruiting wall); some towards or away from the aisle.
        var azimuth = rng.NextBool(0.8)
            ? (rng.NextBool(0.5) ? 0 : Math.PI) + (rng.NextGaussian() * 0.45)
            : (rng.NextBool(0.5) ? Math.PI / 2 : -Math.PI / 2) + (rng.NextGaussian() * 0.35);
        var ratio = rng.NextBool(0.12) ? rng.NextDouble(0.55, 0.8) : rng.NextDouble(0.18, 0.62);
        var baseDiameterMm = Math.Max(5.0, ratio * leaderDiameterMm);
        var tipDiameterMm = Math.Max(3.0, baseDiameterMm * 0.35);
        var lengthM = AllowedLateralLengthM(z, heightM) * rng.NextDouble(0.6, 1.35);
        var upper = z / heightM > 0.6;
        var elevation = (upper ? rng.NextDouble(-5, 25) : rng.NextDouble(-20, 10)) * Math.PI / 180;

        var lateral = new Limb(LimbKind.Lateral, leader, z, azimuth, baseDiameterMm, leaderDiameterMm);
        const int segments = 3;
        Vec3 Direction(int s)
        {
            // Each piece droops a little more, as laterals bend under their own weight and fruit.
            var el = elevation - (s * 5 * Math.PI / 180);
            return new Vec3(Math.Cos(el) * Math.Cos(azimuth), Math.Cos(el) * Math.Sin(azimuth), Math.Sin(el));
        }

        lengthM = Hedged(hedge, wood.Positions[attachNode], Enumerable.Range(0, segments).Select(Direction).ToArray(), lengthM, baseDiameterMm / 2000);
        var node = attachNode;
        var position = wood.Positions[attachNode];
        var nodesAlong = new List<int> { attachNode };
        for (var s = 0; s < segments; s++)
        {
            var next = position + (Direction(s) * (lengthM / segments));
            var nextNode = wood.AddNode(next);
            var d0 = baseDiameterMm + ((tipDiameterMm - baseDiameterMm) * s / segments);
            var d1 = baseDiameterMm + ((tipDiameterMm - baseDiameterMm) * (s + 1) / segments);
            lateral.Branches.Add(wood.AddBranch(node, nextNode, d0 / 2000, d1 / 2000));
            lateral.SegmentLengthsM.Add(Vec3.Distance(wood.Positions[node], wood.Positions[nextNode]));
            node = nextNode;
            position = wood.Positions[nextNode];
            nodesAlong.Add(nextNode);
        }

        // Side shoots on the longer laterals, and now and then a vigorous upright shoot (a water sprout).
        if (lengthM > 0.45)
        {
            var shoots = rng.NextInt(0, 3);
            for (var k = 0; k < shoots; k++)
            {
                var at = rng.NextInt(1, segments);
                var hostDiameter = baseDiameterMm + ((tipDiameterMm - baseDiameterMm) * at / segments);
                var az = azimuth + (rng.NextBool(0.5) ? 1 : -1) * rng.NextDouble(0.7, 1.2);
                lateral.Children.Add(GrowShoot(wood, rng, hedge, lateral, LimbKind.SideShoot, nodesAlong[at], z, az, rng.NextDouble(10, 30) * Math.PI / 180,
                    rng.NextDouble(0.12, 0.3), Math.Min(rng.NextDouble(4, 7), 0.6 * hostDiameter), hostDiameter, pieces: 1));
            }
        }

        if (lengthM > 0.3 && z < heightM - 0.8 && rng.NextBool(0.3))
        {
            var at = rng.NextInt(1, segments);
            var hostDiameter = baseDiameterMm + ((tipDiameterMm - baseDiameterMm) * at / segments);
            lateral.Children.Add(GrowShoot(wood, rng, hedge, lateral, LimbKind.UprightShoot, nodesAlong[at], z, azimuth + (rng.NextGaussian() * 0.3), rng.NextDouble(70, 85) * Math.PI / 180,
                rng.NextDouble(0.3, 0.6), Math.Max(4.0, Math.Min(rng.NextDouble(6, 11), 0.7 * hostDiameter)), hostDiameter, pieces: 2));
        }

        return lateral;
    }

    private static Limb GrowShoot(TreeWood wood, DeterministicRandom rng, StowedArmEnvelope hedge, Limb host, LimbKind kind, int attachNode, double attachHeightM, double azimuth, double elevation, double lengthM, double diameterMm, double hostDiameterMm, int pieces)
    {
        var shoot = new Limb(kind, host, attachHeightM, azimuth, diameterMm, hostDiameterMm);
        var directions = Enumerable.Range(0, pieces).Select(_ =>
        {
            var bend = rng.NextGaussian() * 0.05;
            return new Vec3(Math.Cos(elevation + bend) * Math.Cos(azimuth), Math.Cos(elevation + bend) * Math.Sin(azimuth), Math.Sin(elevation + bend));
        }).ToArray();
        lengthM = Hedged(hedge, wood.Positions[attachNode], directions, lengthM, diameterMm / 2000);
        var node = attachNode;
        for (var s = 0; s < pieces; s++)
        {
            var direction = directions[s];
            var next = wood.AddNode(wood.Positions[node] + (direction * (lengthM / pieces)));
            var d0 = diameterMm * (1 - (0.5 * s / pieces));
            var d1 = diameterMm * (1 - (0.5 * (s + 1) / pieces));
            shoot.Branches.Add(wood.AddBranch(node, next, d0 / 2000, Math.Max(2.0, d1) / 2000));
            shoot.SegmentLengthsM.Add(Vec3.Distance(wood.Positions[node], wood.Positions[next]));
            node = next;
        }

        return shoot;
    }
}
