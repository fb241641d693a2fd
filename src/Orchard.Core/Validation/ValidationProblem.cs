namespace Orchard.Core.Validation;

/// <summary>One thing wrong with a document.</summary>
/// <param name="Path">JSON path of the offending field, e.g. <c>$.branches[3].fromNode</c>.</param>
/// <param name="Code">Stable machine-readable code, e.g. <c>branch.missingNode</c>.</param>
/// <param name="Message">Plain words for a person.</param>
public sealed record ValidationProblem(string Path, string Code, string Message, ProblemSeverity Severity)
{
    public static ValidationProblem Error(string path, string code, string message) =>
        new(path, code, message, ProblemSeverity.Error);

    public static ValidationProblem Warning(string path, string code, string message) =>
        new(path, code, message, ProblemSeverity.Warning);
}
