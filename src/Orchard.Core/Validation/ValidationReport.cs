namespace Orchard.Core.Validation;

/// <summary>Every problem found in one document, errors and warnings kept apart.</summary>
public sealed class ValidationReport
{
    public ValidationReport(IReadOnlyList<ValidationProblem> problems)
    {
        Problems = problems;
        Errors = problems.Where(p => p.Severity == ProblemSeverity.Error).ToArray();
        Warnings = problems.Where(p => p.Severity == ProblemSeverity.Warning).ToArray();
    }

    public IReadOnlyList<ValidationProblem> Problems { get; }

    public IReadOnlyList<ValidationProblem> Errors { get; }

    public IReadOnlyList<ValidationProblem> Warnings { get; }

    public bool IsValid => Errors.Count == 0;
}
