using System.Runtime.InteropServices;

namespace Orchard.Service.Bench;

/// <summary>What a benchmark ran on, written beside its figures.</summary>
internal sealed record MachineInfo(string Os, string Framework, string Architecture, int LogicalCores, bool Release)
{
    public static MachineInfo Current() => new(
        RuntimeInformation.OSDescription,
        RuntimeInformation.FrameworkDescription,
        RuntimeInformation.ProcessArchitecture.ToString(),
        Environment.ProcessorCount,
#if DEBUG
        Release: false);
#else
        Release: true);
#endif
}
