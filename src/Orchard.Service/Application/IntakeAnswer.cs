using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>What an intake handler answers; the endpoint turns it into HTTP (see Api.Answers).</summary>
public abstract record IntakeAnswer
{
    private IntakeAnswer()
    {
    }

    /// <summary>Done (or queued): <paramref name="Body"/> (none for 204) with <paramref name="Location"/> when there is something to watch.</summary>
    public sealed record Accepted(int StatusCode, object Body, string? Location) : IntakeAnswer
    {
        /// <summary>The answer carries a secret: <c>Cache-Control: no-store</c>.</summary>
        public bool CarriesSecret { get; init; }
    }

    /// <summary>
    /// Refused as an RFC 9457 problem naming each bad field (<paramref name="Problems"/>, with JSON paths);
    /// <paramref name="Extensions"/> adds members, <paramref name="RetryAfterSeconds"/> a Retry-After header.
    /// </summary>
    public sealed record Refused(int StatusCode, string Title, IReadOnlyList<ValidationProblem> Problems) : IntakeAnswer
    {
        public IReadOnlyDictionary<string, object?>? Extensions { get; init; }

        public int? RetryAfterSeconds { get; init; }

        public static Refused One(int statusCode, string title, string path, string code, string message) =>
            new(statusCode, title, [ValidationProblem.Error(path, code, message)]);
    }

    /// <summary>An earlier request with the same idempotency key: its answer again (or 422 when the body differs).</summary>
    public sealed record Replayed(IdempotencyRecord Record, string RequestHashHex) : IntakeAnswer;
}
