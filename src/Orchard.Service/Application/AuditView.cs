namespace Orchard.Service.Application;

/// <summary>One line of the audit trail: which key did what to what, when.</summary>
public sealed record AuditView(long Id, DateTimeOffset At, string? KeyId, string Action, string Target, string? Detail);
