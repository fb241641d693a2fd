namespace Orchard.Service.Tests;

/// <summary>
/// The reliability runs' size. CI runs the short profile; <c>ORCHARD_PROFILE=long</c> runs the full one
/// (see README, "Reliability runs").
/// </summary>
internal static class TestProfile
{
    public static bool IsLong => string.Equals(Environment.GetEnvironmentVariable("ORCHARD_PROFILE"), "long", StringComparison.OrdinalIgnoreCase);

    public static T Pick<T>(T ci, T longRun) => IsLong ? longRun : ci;
}
