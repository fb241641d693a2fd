using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>Answer to an accepted scan: where to watch its plan, and what looked unusual in it.</summary>
public sealed record ScanAccepted(string JobId, string TreeId, string ScanId, JobStatus Status, IReadOnlyList<FieldProblem> Warnings);
