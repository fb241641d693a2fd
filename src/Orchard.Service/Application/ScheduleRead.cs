using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>What <see cref="ScheduleReader"/> found.</summary>
public abstract record ScheduleRead
{
    private ScheduleRead()
    {
    }

    public sealed record NoTree : ScheduleRead;

    /// <summary>Never planned yet, or scanned again and the new scan's plan still on the way.</summary>
    public sealed record NotPlanned(TreeRecord Tree) : ScheduleRead;

    /// <summary>The current schedule: its version and its UTF-8 body.</summary>
    public sealed record Current(int Version, byte[] Body) : ScheduleRead;
}
