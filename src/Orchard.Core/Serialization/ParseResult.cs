using Orchard.Core.Validation;

namespace Orchard.Core.Serialization;

/// <summary>Either a parsed document (<see cref="Value"/>) or the problem that stopped reading it.</summary>
public sealed record ParseResult<T>(T? Value, ValidationProblem? Problem)
    where T : class
{
    public bool Succeeded => Value is not null;
}
