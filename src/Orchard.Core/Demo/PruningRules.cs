using Orchard.Core.Model;

namespace Orchard.Core.Demo;

/// <summary>
/// Marks dormant-pruning cuts on a generated tree by the rules tall-spindle growers use
/// (common practice): keep the leader dominant, keep laterals apart, keep the spindle's cone shape,
/// and take out vigorous upright shoots. Rules run in that order; a limb removed by one rule is not
/// cut again by a later one, and nothing beyond a heading cut is marked.
/// </summary>
internal static class PruningRules
{
    public static IReadOnlyList<Cut> MarkCuts(TreeWood wood, Limb leader, double treeHeightM, PruningRuleSettings rules)
    {
        var marks = new List<(double HeightM, int Branch, double Position, CutKind Kind, double? StubM)>();
        var laterals = leader.Children.OrderBy(l => l.AttachHeightM).ToList();

        // Height control: head the leader back when it has outgrown the top of the trellis.
        var leaderLimitM = double.PositiveInfinity;
        if (treeHeightM > rules.LeaderHeadingAboveM && At(wood, leader, rules.LeaderHeadingHeightM, out var lb, out var lp))
        {
            marks.Add((rules.LeaderHeadingHeightM, lb, lp, CutKind.Heading, null));
            leaderLimitM = rules.LeaderHeadingHeightM;
        }

        foreach (var lateral in laterals.Where(l => l.AttachHeightM >= leaderLimitM))
        {
            lateral.Removed = true; // Goes with the leader's top.
        }

        // Leader dominance: a lateral over about half the leader's diameter competes with it. It is taken out
        // with a renewal cut, whose stub grows the replacement shoot.
        foreach (var lateral in laterals.Where(l => !l.Removed && l.BaseDiameterMm > rules.MaxLateralToLeaderRatio * l.ParentDiameterAtAttachMm))
        {
            Thin(lateral, renewal: true);
        }

        // Spacing: of two laterals on the same side too close together, the thinner goes.
        var kept = laterals.Where(l => !l.Removed).ToList();
        for (var i = 0; i < kept.Count; i++)
        {
            for (var j = i + 1; j < kept.Count && kept[j].AttachHeightM - kept[i].AttachHeightM < rules.MinLateralSpacingM; j++)
            {
                if (kept[i].Removed || kept[j].Removed || AzimuthGap(kept[i].AzimuthRad, kept[j].AzimuthRad) > rules.SameSideAzimuthRad)
                {
                    continue;
                }

                Thin(kept[i].BaseDiameterMm <= kept[j].BaseDiameterMm ? kept[i] : kept[j]);
            }
        }

        // Shape: head back laterals that reach beyond the cone; shoots past the cut go with it.
        foreach (var lateral in laterals.Where(l => !l.Removed))
        {
            var allowed = DemoTreeGenerator.AllowedLateralLengthM(lateral.AttachHeightM, treeHeightM);
            if (lateral.LengthM > rules.OverLengthFactor * allowed && Along(lateral, allowed, out var segment, out var position))
            {
                marks.Add((lateral.AttachHeightM, lateral.Branches[segment], position, CutKind.Heading, null));
                foreach (var shoot in lateral.Children.Where(s => AttachSegment(wood, lateral, s) >= segment))
                {
                    shoot.Removed = true;
                }
            }

            // Vigour: an upright shoot on a kept lateral is taken out.
            foreach (var shoot in lateral.Children.Where(s => s.Kind == LimbKind.UprightShoot && !s.Removed))
            {
                Thin(shoot);
            }
        }

        return marks
            .OrderBy(m => m.HeightM)
            .ThenBy(m => m.Branch)
            .Select((m, k) => new Cut($"c{k + 1:D2}", wood.Branches[m.Branch].Id, m.Position, m.Kind, wood.DiameterMmAt(m.Branch, m.Position), m.StubM))
            .ToArray();

        void Thin(Limb limb, bool renewal = false)
        {
            limb.Removed = true;
            // From the parent's axis: its radius, then the stub. A renewal cut is placed there by its kind (the
            // scan's positionAlong says the same); where the branch is too short or long for that to land inside
            // the usual span of it, the cut stays a thinning cut at the clamped place.
            var fromAxisM = (limb.ParentDiameterAtAttachMm / 2000) + rules.ThinningStubM;
            var exact = fromAxisM / limb.SegmentLengthsM[0];
            var asRenewal = renewal && exact is >= 0.05 and <= 0.6;
            var position = asRenewal ? exact : Math.Round(Math.Clamp(exact, 0.05, 0.6), 3);
            marks.Add((limb.AttachHeightM, limb.Branches[0], position, asRenewal ? CutKind.Renewal : CutKind.Thinning, asRenewal ? rules.ThinningStubM : null));
        }
    }

    private static double AzimuthGap(double a, double b)
    {
        var gap = Math.Abs(Math.IEEERemainder(a - b, 2 * Math.PI));
        return gap;
    }

    /// <summary>The branch and position along it at a given distance out along a limb.</summary>
    private static bool Along(Limb limb, double distanceM, out int segment, out double position)
    {
        var before = 0.0;
        for (var s = 0; s < limb.SegmentLengthsM.Count; s++)
        {
            var length = limb.SegmentLengthsM[s];
            if (before + length >= distanceM)
            {
                segment = s;
                position = Math.Round(Math.Clamp((distanceM - before) / length, 0.05, 0.95), 3);
                return true;
            }

            before += length;
        }

        segment = -1;
        position = 0;
        return false;
    }

    /// <summary>The leader's branch and position at a height.</summary>
    private static bool At(TreeWood wood, Limb leader, double heightM, out int branch, out double position)
    {
        foreach (var b in leader.Branches)
        {
            var from = wood.Positions[wood.Nodes.FindIndex(n => n.Id == wood.Branches[b].FromNode)];
            var to = wood.Positions[wood.Nodes.FindIndex(n => n.Id == wood.Branches[b].ToNode)];
            if (from.Z <= heightM && to.Z > heightM)
            {
                branch = b;
                position = Math.Round(Math.Clamp((heightM - from.Z) / (to.Z - from.Z), 0.05, 0.95), 3);
                return true;
            }
        }

        branch = -1;
        position = 0;
        return false;
    }

    /// <summary>Which of the host limb's branches a shoot grows from (the index of the branch ending at its attachment node).</summary>
    private static int AttachSegment(TreeWood wood, Limb host, Limb shoot)
    {
        var attachNode = wood.Branches[shoot.Branches[0]].FromNode;
        return host.Branches.FindIndex(b => wood.Branches[b].ToNode == attachNode);
    }
}
