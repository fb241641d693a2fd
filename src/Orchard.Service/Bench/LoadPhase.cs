namespace Orchard.Service.Bench;

/// <summary>
/// One fixed-rate phase of a load run: <paramref name="RatePerSecond"/> requests a second for
/// <paramref name="Duration"/>, each built by <paramref name="NewRequest"/> from its sequence number.
/// </summary>
internal sealed record LoadPhase(string Name, double RatePerSecond, TimeSpan Duration, Func<long, HttpRequestMessage> NewRequest)
{
    public long TotalRequests => (long)Math.Round(RatePerSecond * Duration.TotalSeconds);
}
