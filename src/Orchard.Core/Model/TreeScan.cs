namespace Orchard.Core.Model;

/// <summary>
/// One scanned tree as the field tablet posts it. Tree frame: origin at the trunk base, z up,
/// x along the row, y across the row towards the aisle where the platform drives.
/// </summary>
public sealed record TreeScan(
    string TreeId,
    string Block,
    string Row,
    int PositionInRow,
    DateTimeOffset ScannedAt,
    ArmBasePose ArmBase,
    IReadOnlyList<ScanNode> Nodes,
    IReadOnlyList<Branch> Branches,
    IReadOnlyList<Obstacle> Obstacles,
    IReadOnlyList<Cut> Cuts);
