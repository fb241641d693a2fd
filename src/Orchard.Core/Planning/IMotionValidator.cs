namespace Orchard.Core.Planning;

/// <summary>
/// What a planner asks of the world: is a configuration free, is the straight motion between two free, how much room
/// a configuration has; every question is counted, so budgets and statistics need nothing else.
/// </summary>
public interface IMotionValidator
{
    /// <summary>The space the configurations live in.</summary>
    IConfigurationSpace Space { get; }

    /// <summary>Questions asked so far, of every kind.</summary>
    long Checks { get; }

    bool IsFree(ReadOnlySpan<double> q);

    /// <summary>Is every configuration of the edge a → b (as <see cref="IConfigurationSpace.Interpolate"/> runs it) free?</summary>
    bool IsMotionFree(ReadOnlySpan<double> a, ReadOnlySpan<double> b);

    /// <summary>Distance to the nearest obstacle (metres for the arm; negative in contact).</summary>
    double ClearanceM(ReadOnlySpan<double> q);
}
