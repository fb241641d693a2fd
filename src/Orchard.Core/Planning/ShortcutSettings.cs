namespace Orchard.Core.Planning;

/// <summary>Settings of <see cref="PathShortcutter"/>. Defaults in brackets.</summary>
public sealed record ShortcutSettings
{
    /// <summary>Random shortcut attempts between two waypoints [24].</summary>
    public int RandomAttempts { get; init; } = 24;

    public static ShortcutSettings Default { get; } = new();
}
