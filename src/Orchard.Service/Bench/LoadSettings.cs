namespace Orchard.Service.Bench;

/// <summary>
/// A load run's shape. Defaults are the long profile's (the targets: GET schedule at 3,000 a
/// second); the CI test runs a shorter, slower one.
/// </summary>
/// <param name="PostgresConnectionString">Run on this PostgreSQL server, in a new database made for the run from this connection (and dropped after); null runs on the embedded store in a temp folder.</param>
/// <param name="GetPerSecond">Offered rate of GET /trees/{id}/schedule (controllers fetching their schedules).</param>
/// <param name="PostPerSecond">Offered rate of POST /scans (tablets posting whole demo trees).</param>
/// <param name="Connections">Most HTTP/1.1 connections the generator keeps open to the API.</param>
/// <param name="SeedTrees">Demo trees planned before the run, whose schedules the GET phase reads in turn.</param>
/// <param name="ServerAssembly">The <c>orchard.dll</c> to run as the API; null runs this build's. Another build's path measures a baseline side by side.</param>
internal sealed record LoadSettings(
    string? PostgresConnectionString = null,
    double GetPerSecond = 3000,
    double PostPerSecond = 100,
    TimeSpan? Duration = null,
    TimeSpan? Warmup = null,
    int Connections = 32,
    int SeedTrees = 4,
    string? ServerAssembly = null)
{
    public TimeSpan PhaseDuration => Duration ?? TimeSpan.FromSeconds(20);

    public TimeSpan WarmupDuration => Warmup ?? TimeSpan.FromSeconds(5);
}
