using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// The controller's read: the tree's current schedule, which is its newest version only when that was
/// planned from the tree's newest scan. The tree's row says which version is current; the body comes from
/// <see cref="ScheduleBodyCache"/> when it holds that version (versions never change once written), else
/// from the store. The body's version is the store's, so it always equals the version answered here.
/// </summary>
public sealed class ScheduleReader(IOrchardStore store, ScheduleBodyCache bodies)
{
    public async Task<ScheduleRead> CurrentAsync(string treeId, CancellationToken cancellationToken)
    {
        var tree = await store.GetTreeAsync(treeId, cancellationToken);
        if (tree is null)
        {
            return new ScheduleRead.NoTree();
        }

        if (!tree.IsPlannedForLatestScan)
        {
            return new ScheduleRead.NotPlanned(tree);
        }

        var version = tree.CurrentVersion!.Value;
        if (bodies.Find(treeId, version) is { } cached)
        {
            return new ScheduleRead.Current(version, cached);
        }

        var schedule = await store.GetCurrentScheduleAsync(treeId, cancellationToken);
        return schedule is null || schedule.ScanId != tree.LatestScanId
            ? new ScheduleRead.NotPlanned(tree)
            : new ScheduleRead.Current(schedule.Version, bodies.Keep(treeId, schedule.Version, schedule.ScheduleJson));
    }
}
