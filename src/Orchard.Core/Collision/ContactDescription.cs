using System.Globalization;

namespace Orchard.Core.Collision;

/// <summary>
/// A configuration report in a person's words: which arm link, and which branch, wire or post of the
/// scan (by its id), the ground, another link or the base it touches or comes nearest to.
/// </summary>
/// <param name="ArmLink">The arm link's name (the joint it follows, <c>shear</c> or <c>base</c>), or null.</param>
/// <param name="Touches">What it touches or comes nearest to, e.g. <c>branch b39</c>, <c>wire wire-2</c>, <c>the ground</c>.</param>
public sealed record ContactDescription(string? ArmLink, string? Touches)
{
    public static ContactDescription Of(WorkCell cell, in ConfigurationReport report)
    {
        ArgumentNullException.ThrowIfNull(cell);
        var names = cell.Arm.LinkNames;
        string? Link(int link) => link >= 0 && link < names.Count ? names[link] : null;
        var touches = report.Contact switch
        {
            ContactKind.Ground => "the ground",
            ContactKind.JointLimit => "a joint limit",
            ContactKind.Self => report.OtherArmLink == cell.Arm.JointCount + 1 ? "the base (lift mast)" : $"its own {Link(report.OtherArmLink) ?? "link"} link",
            _ => SceneThing(cell, report.SceneCapsule),
        };
        return new ContactDescription(Link(report.ArmLink), touches);
    }

    /// <summary>A scene capsule by the id the scan gave it.</summary>
    public static string? SceneThing(WorkCell cell, int sceneCapsule)
    {
        ArgumentNullException.ThrowIfNull(cell);
        var scene = cell.Scene;
        if (sceneCapsule < 0 || sceneCapsule >= scene.Capsules.Count)
        {
            return null;
        }

        var branch = scene.BranchOfCapsule[sceneCapsule];
        if (branch >= 0)
        {
            return "branch " + cell.Scan.Branches[branch].Id;
        }

        // Obstacles follow the wood in the scene, in the scan's order; count the wood capsules before this one.
        var wood = scene.BranchOfCapsule.Count(b => b >= 0);
        var obstacle = cell.Scan.Obstacles[sceneCapsule - wood];
        var kind = scene.Kinds[sceneCapsule] switch
        {
            SceneCapsuleKind.Wire => "wire",
            SceneCapsuleKind.Post => "post",
            _ => "obstacle",
        };
        return string.Create(CultureInfo.InvariantCulture, $"{kind} {obstacle.Id}");
    }
}
