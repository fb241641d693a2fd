using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>Answer to an outcome: recorded, and the re-plan job it started or joined (for <c>missed</c>).</summary>
public sealed record OutcomeAccepted(string TreeId, int Version, string CutId, CutOutcome Outcome, string? ReplanJobId);
