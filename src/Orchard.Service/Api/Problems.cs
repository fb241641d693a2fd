using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Core.Validation;
using ValidationProblem = Orchard.Core.Validation.ValidationProblem;

namespace Orchard.Service.Api;

/// <summary>RFC 9457 problem responses, every bad field named by its JSON path.</summary>
public static class Problems
{
    public static ProblemHttpResult Invalid(int status, string title, IEnumerable<ValidationProblem> problems, string? detail = null, IReadOnlyDictionary<string, object?>? extensions = null)
    {
        var list = problems.ToList();
        var members = new Dictionary<string, object?>
        {
            ["errors"] = list.Where(p => p.Severity == ProblemSeverity.Error).Select(Shape).ToArray(),
            ["warnings"] = list.Where(p => p.Severity == ProblemSeverity.Warning).Select(Shape).ToArray(),
        };
        foreach (var (name, value) in extensions ?? new Dictionary<string, object?>())
        {
            members[name] = value;
        }

        return TypedResults.Problem(
            title: title,
            detail: detail ?? string.Join(" ", list.Where(p => p.Severity == ProblemSeverity.Error).Take(3).Select(p => $"{p.Path}: {p.Message}")),
            statusCode: status,
            type: $"https://orchard.invalid/problems/{(status == StatusCodes.Status400BadRequest ? "malformed" : "invalid")}",
            extensions: members);
    }

    public static ProblemHttpResult Of(int status, string title, string detail, string? path = null, string code = "request") =>
        path is null
            ? TypedResults.Problem(title: title, detail: detail, statusCode: status)
            : Invalid(status, title, [ValidationProblem.Error(path, code, detail)], detail);

    private static object Shape(ValidationProblem p) => new { path = p.Path, code = p.Code, message = p.Message };
}
