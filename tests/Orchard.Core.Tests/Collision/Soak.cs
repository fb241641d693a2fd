namespace Orchard.Core.Tests.Collision;

/// <summary>
/// Test sizes. By default the collision tests run at sizes that keep the suite short in a Debug build; with the
/// environment variable ORCHARD_SOAK=1 the expensive ones run at full size (minutes in a Debug build).
/// </summary>
internal static class Soak
{
    public static bool Enabled { get; } = Environment.GetEnvironmentVariable("ORCHARD_SOAK") == "1";

    public static int Size(int quick, int soak) => Enabled ? soak : quick;
}
