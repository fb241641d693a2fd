namespace Orchard.Core.Estimates;

/// <summary>
/// One tree as the store knows it, the input of the time estimates.
/// </summary>
/// <param name="TreeId">Stable id of the tree.</param>
/// <param name="BlockId">Block the tree stands in.</param>
/// <param name="RowId">Row the tree stands in (unique within its block).</param>
/// <param name="PositionInRow">Position along the row, 0 at the row start.</param>
/// <param name="IsPlanned">Whether a cut schedule has been planned for the tree.</param>
/// <param name="ScheduleSeconds">Total arm seconds of the planned schedule; null when not planned.</param>
/// <param name="ScheduledCuts">Cuts in the schedule (0 when not planned).</param>
/// <param name="UnreachableCuts">Cuts the planner could not reach (left for hand follow-up).</param>
/// <param name="MootCuts">Cuts made unnecessary by an earlier cut that removed their wood.</param>
/// <param name="ScanCutCount">Cuts the pruning rules chose on the scan, before planning; known for every scanned tree.</param>
/// <param name="TotalBranchLengthM">Summed length of all branches in the scan, the tree's size.</param>
/// <param name="NodeCount">Nodes in the scanned skeleton (informational; the time model uses the branch length).</param>
/// <param name="FarSideStops">Stops of the planned schedule on the far side of the row (worked from the next alley).</param>
/// <param name="HandCuts">Cuts of the planned schedule left for a person: unreachable, dropped, or not planned before a deadline.</param>
/// <param name="PlannedCutSeconds">Shear seconds of the scheduled cuts as planned (part of <paramref name="ScheduleSeconds"/>).</param>
/// <param name="CutDiameterSumMm">Σ of the scheduled cuts' diameters, mm (for a measured cut-time line).</param>
public sealed record TreeRecord(
    string TreeId,
    string BlockId,
    string RowId,
    int PositionInRow,
    bool IsPlanned,
    double? ScheduleSeconds,
    int ScheduledCuts,
    int UnreachableCuts,
    int MootCuts,
    int ScanCutCount,
    double TotalBranchLengthM,
    int NodeCount,
    int FarSideStops = 0,
    int HandCuts = 0,
    double PlannedCutSeconds = 0,
    double CutDiameterSumMm = 0);
