using Orchard.Core.Sequencing;

namespace Orchard.Store;

/// <summary>The words the stores keep for typed values (the same words the API shows).</summary>
internal static class StoreText
{
    public static string Of(JobKind kind) => kind switch
    {
        JobKind.Plan => "plan",
        JobKind.Replan => "replan",
        _ => throw new ArgumentOutOfRangeException(nameof(kind)),
    };

    public static JobKind JobKindOf(string text) => text switch
    {
        "plan" => JobKind.Plan,
        "replan" => JobKind.Replan,
        _ => throw new InvalidDataException($"Unknown job kind '{text}' in the store."),
    };

    public static string Of(JobStatus status) => status switch
    {
        JobStatus.Queued => "queued",
        JobStatus.Running => "running",
        JobStatus.Done => "done",
        JobStatus.Failed => "failed",
        JobStatus.Superseded => "superseded",
        _ => throw new ArgumentOutOfRangeException(nameof(status)),
    };

    public static JobStatus JobStatusOf(string text) => text switch
    {
        "queued" => JobStatus.Queued,
        "running" => JobStatus.Running,
        "done" => JobStatus.Done,
        "failed" => JobStatus.Failed,
        "superseded" => JobStatus.Superseded,
        _ => throw new InvalidDataException($"Unknown job status '{text}' in the store."),
    };

    public static string Of(CutOutcome outcome) => outcome switch
    {
        CutOutcome.Done => "done",
        CutOutcome.Missed => "missed",
        CutOutcome.Skipped => "skipped",
        _ => throw new ArgumentOutOfRangeException(nameof(outcome)),
    };

    public static CutOutcome CutOutcomeOf(string text) => text switch
    {
        "done" => CutOutcome.Done,
        "missed" => CutOutcome.Missed,
        "skipped" => CutOutcome.Skipped,
        _ => throw new InvalidDataException($"Unknown outcome '{text}' in the store."),
    };

    public static string Of(RetryPolicy policy) => policy switch
    {
        RetryPolicy.RetryNow => "retryNow",
        RetryPolicy.RetryLast => "retryLast",
        RetryPolicy.Drop => "drop",
        _ => throw new ArgumentOutOfRangeException(nameof(policy)),
    };

    /// <summary>Stored policies; the words of the first version ("retry-last" in old test data) read as retry last.</summary>
    public static RetryPolicy RetryPolicyOf(string text) => text switch
    {
        "retryNow" => RetryPolicy.RetryNow,
        "drop" => RetryPolicy.Drop,
        _ => RetryPolicy.RetryLast,
    };

    /// <summary>Why a job was superseded, for its error column and the worker's log.</summary>
    public const string SupersededByScan = "Superseded: the tree was scanned again before this plan was written; the newer scan's plan job replaces it.";

    public const string SupersededByVersion = "Superseded: the schedule version this job re-plans is no longer the tree's current version.";
}
