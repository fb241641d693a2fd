namespace Orchard.Service.Auth;

/// <summary>The roles an API key can have, and the policies endpoints ask for.</summary>
public static class Roles
{
    public const string Tablet = "tablet";
    public const string Controller = "controller";
    public const string Manager = "manager";
    public const string Admin = "admin";

    public static IReadOnlySet<string> All { get; } = new HashSet<string>(StringComparer.Ordinal) { Tablet, Controller, Manager, Admin };
}
