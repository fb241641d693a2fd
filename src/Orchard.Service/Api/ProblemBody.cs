using Orchard.Service.Application;

namespace Orchard.Service.Api;

/// <summary>
/// Every error answer: an RFC 9457 problem (<c>application/problem+json</c>). <see cref="Errors"/> names each
/// bad field by its JSON path. A refused outcome (409) also says the <see cref="CurrentVersion"/> and the
/// tree's <see cref="LatestScanId"/>; a schedule not planned yet (404) the tree's newest <see cref="ScanId"/>
/// and, after a re-scan, the <see cref="PreviousVersion"/> not to go on with.
/// </summary>
public sealed record ProblemBody(
    string Title,
    int Status,
    string? Type = null,
    string? Detail = null,
    string? Instance = null,
    string? TraceId = null,
    IReadOnlyList<FieldProblem>? Errors = null,
    IReadOnlyList<FieldProblem>? Warnings = null,
    int? CurrentVersion = null,
    string? LatestScanId = null,
    string? ScanId = null,
    int? PreviousVersion = null);
