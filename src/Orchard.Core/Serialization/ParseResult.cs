using Orchard.Core.Validation;

namespace Orchard.Core.Serialization;

/// <summary>Either a parsed document (<see cref="Value"/>) or every problem that kept it from being read.</summary>
public sealed record ParseResult<T>(T? Value, IReadOnlyList<ValidationProblem> Problems)
    where T : class
{
    public bool Succeeded => Value is not null;

    /// <summary>The first problem (null when reading succeeded).</summary>
    public ValidationProblem? Problem => Problems.Count > 0 ? Problems[0] : null;
}
