namespace Orchard.Service.Cli;

/// <summary>
/// The field loop as curl commands against a running service, for people to paste into a shell: a tablet
/// scans a tree again, the plan job runs, the controller fetches the schedule (its ETag is the version),
/// reports the first cut done and the second missed from where the arm is, and fetches the re-planned
/// version. Only curl, grep and sed; `demo` prints it with its own address and keys, the README with names.
/// </summary>
internal static class DemoWalkthrough
{
    public static string Script(string url, string tabletKey, string controllerKey, string managerKey, string treeId)
    {
        var lines = new[]
        {
            "# In an empty folder, with curl, grep and sed:",
            $"URL='{url.TrimEnd('/')}'",
            $"TABLET='{tabletKey}'",
            $"CONTROLLER='{controllerKey}'",
            $"MANAGER='{managerKey}'",
            $"TREE='{treeId}'",
            "wait_done() { for i in $(seq 1 300); do case \"$(curl -s -H \"X-Api-Key: $2\" \"$URL/api/v1/jobs/$1\")\" in *'\"status\":\"done\"'*) return 0;; *'\"status\":\"failed\"'*|*'\"status\":\"superseded\"'*) echo \"job $1 did not plan\" >&2; return 1;; esac; sleep 1; done; echo \"job $1 did not finish\" >&2; return 1; }",
            "# 1. The tablet posts the tree's scan again (here the stored one; 202 with the plan job):",
            "curl -s -H \"X-Api-Key: $MANAGER\" \"$URL/api/v1/trees/$TREE/scan\" -o scan.json",
            "JOB=$(curl -s -X POST -H \"X-Api-Key: $TABLET\" -H \"Content-Type: application/json\" -H \"Idempotency-Key: walk-$(date +%s)\" --data-binary @scan.json \"$URL/api/v1/scans\" | sed -n 's/.*\"jobId\":\"\\([^\"]*\\)\".*/\\1/p')",
            "wait_done \"$JOB\" \"$TABLET\"",
            "# 2. The controller fetches the new schedule; its ETag is the version:",
            "curl -s -D headers.txt -o schedule.json -H \"X-Api-Key: $CONTROLLER\" \"$URL/api/v1/trees/$TREE/schedule\"",
            "V=$(sed -n 's/^[Ee][Tt][Aa][Gg]: \"v\\([0-9]*\\)\".*/\\1/p' headers.txt); echo \"schedule version $V\"",
            "CUT1=$(grep -o '\"cutId\":\"[^\"]*\"' schedule.json | sed -n '1s/.*:\"\\(.*\\)\"/\\1/p')",
            "CUT2=$(grep -o '\"cutId\":\"[^\"]*\"' schedule.json | sed -n '2s/.*:\"\\(.*\\)\"/\\1/p')",
            "HERE=$(grep -o '\"preCutConfiguration\":\\[[^]]*\\]' schedule.json | sed -n '2s/^[^:]*://p')",
            "# 3. The first cut is made:",
            "curl -s -X POST -H \"X-Api-Key: $CONTROLLER\" -H \"Content-Type: application/json\" -H \"Idempotency-Key: walk-$V-$CUT1\" -d \"{\\\"version\\\":$V,\\\"cutId\\\":\\\"$CUT1\\\",\\\"outcome\\\":\\\"done\\\"}\" \"$URL/api/v1/trees/$TREE/outcomes\"; echo",
            "# 4. The second is missed, the arm at its pre-cut pose: a re-plan from there (202 with its job):",
            "REPLAN=$(curl -s -X POST -H \"X-Api-Key: $CONTROLLER\" -H \"Content-Type: application/json\" -H \"Idempotency-Key: walk-$V-$CUT2\" -d \"{\\\"version\\\":$V,\\\"cutId\\\":\\\"$CUT2\\\",\\\"outcome\\\":\\\"missed\\\",\\\"configuration\\\":$HERE}\" \"$URL/api/v1/trees/$TREE/outcomes\" | sed -n 's/.*\"replanJobId\":\"\\([^\"]*\\)\".*/\\1/p')",
            "wait_done \"$REPLAN\" \"$CONTROLLER\"",
            "# 5. The re-planned schedule: the next version, the first cut done, the missed one retried last:",
            "curl -s -D - -o replanned.json -H \"X-Api-Key: $CONTROLLER\" \"$URL/api/v1/trees/$TREE/schedule\" | grep -i '^etag'",
        };
        return string.Join('\n', lines) + "\n";
    }

    /// <summary>The same walk-through with shell variables in place of the address and keys (the README's).</summary>
    public static string WithPlaceholders(string treeId) =>
        Script("http://127.0.0.1:5080", "<the tablet key demo printed>", "<the controller key>", "<the manager key>", treeId);
}
