namespace Orchard.Service.Api;

/// <summary>
/// Every error answer: an RFC 9457 problem (<c>application/problem+json</c>). <see cref="Errors"/> names each
/// bad field by its JSON path; a stale outcome also says the <see cref="CurrentVersion"/>.
/// </summary>
public sealed record ProblemBody(
    string Title,
    int Status,
    string? Type = null,
    string? Detail = null,
    string? Instance = null,
    string? TraceId = null,
    IReadOnlyList<ProblemItem>? Errors = null,
    IReadOnlyList<ProblemItem>? Warnings = null,
    int? CurrentVersion = null);
