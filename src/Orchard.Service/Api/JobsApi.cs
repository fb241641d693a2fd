using Microsoft.AspNetCore.Http.HttpResults;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary><c>GET /api/v1/jobs/{jobId}</c>: planning status, for any role.</summary>
public static class JobsApi
{
    public static RouteGroupBuilder MapJobs(this RouteGroupBuilder api)
    {
        api.MapGet("/jobs/{jobId}", GetJob).RequireAuthorization().WithSummary("A plan job's status.");
        return api;
    }

    internal static async Task<Results<Ok<JobView>, ProblemHttpResult>> GetJob(string jobId, IOrchardStore store, CancellationToken cancellationToken)
    {
        var job = await store.GetJobAsync(jobId, cancellationToken);
        return job is null
            ? Problems.Of(404, "No such job", $"No plan job '{jobId}'.")
            : TypedResults.Ok(new JobView(job.JobId, job.TreeId, job.Kind, job.Status, job.ScanId, job.BaseVersion, job.Attempt, job.ScheduleVersion, job.Error, job.CreatedAt, job.FinishedAt));
    }
}
