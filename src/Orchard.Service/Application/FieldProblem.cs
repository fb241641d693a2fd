namespace Orchard.Service.Application;

/// <summary>One problem with a field of a request, by its JSON path (<c>$.cuts[2].id</c>, <c>$query.retryPolicy</c>, <c>$header.Content-Type</c>).</summary>
public sealed record FieldProblem(string Path, string Code, string Message);
