namespace Orchard.Service.Api;

/// <summary>One problem in an answer: its JSON path, a stable code and plain words.</summary>
public sealed record ProblemItem(string Path, string Code, string Message);
