namespace Orchard.Core.Planning;

/// <summary>Settings of the production <see cref="MovePlanner"/>: its stages and their budgets.</summary>
public sealed record MovePlannerSettings
{
    /// <summary>The first planner tried [cost-aware RMPD].</summary>
    public RmpdSettings Primary { get; init; } = RmpdSettings.Default;

    /// <summary>The fallback, within the same call [RRT-Connect].</summary>
    public RrtConnectSettings Fallback { get; init; } = RrtConnectSettings.Default;

    /// <summary>Whether to fall back at all [true].</summary>
    public bool UseFallback { get; init; } = true;

    public ShortcutSettings Shortcut { get; init; } = ShortcutSettings.Default;

    public static MovePlannerSettings Default { get; } = new();
}
