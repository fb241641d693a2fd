namespace Orchard.Core.Planning;

/// <summary>Settings of <see cref="PathShortcutter"/>. Defaults in brackets.</summary>
public sealed record ShortcutSettings
{
    /// <summary>Random shortcut attempts between two waypoints [24].</summary>
    public int RandomAttempts { get; init; } = 24;

    /// <summary>
    /// Finally drop every waypoint whose neighbours see each other [true]: each corner left costs a blend or a
    /// stop, so fewer corners execute faster (<c>bench moves</c> measures it against the pass turned off).
    /// </summary>
    public bool DropVisibleWaypoints { get; init; } = true;

    public static ShortcutSettings Default { get; } = new();
}
