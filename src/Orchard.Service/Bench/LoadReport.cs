namespace Orchard.Service.Bench;

/// <summary>A load run's figures: each phase, and the API process's memory.</summary>
/// <param name="ScheduleBytes">Size of one schedule body the GET phase fetched (the first seeded tree's).</param>
/// <param name="ApiPeakResidentMiB">The API process's peak resident memory over its whole life (warm-up and every phase), from /proc VmHWM.</param>
/// <param name="Server">Which build served: "this build" or the baseline's orchard.dll path.</param>
internal sealed record LoadReport(
    string Server,
    MachineInfo Machine,
    string Store,
    int Connections,
    int SeedTrees,
    long ScheduleBytes,
    long ScanBytes,
    IReadOnlyList<LoadPhaseResult> Phases,
    double? ApiPeakResidentMiB,
    double? ApiResidentAfterMiB);
