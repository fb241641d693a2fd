namespace Orchard.Service.Cli;

/// <summary>The verbs of the one executable. Exit codes: 0 done, 1 failed, 2 usage error.</summary>
internal static class CommandLine
{
    public const string Usage = """
        orchard — plans robotic dormant-pruning cut schedules.

        Verbs:
          demo [--seed N] [--trees-per-row N] [--urls URL] [--data DIR]
                                                          plan the invented orchard through the service, then serve it
          demo summary [--seed N] [--trees-per-row N]     the demo orchard's trees, cuts, and what the machine schedules
          demo export DIR [--seed N] [--trees-per-row N]  write each demo tree as a scan file, plus arm.json
          plan FILE [--arm FILE] [--format json|table] [--mode lazy|all-pairs]
                                                          plan one scan offline and print its schedule
          bench checks [--runs N] [--baseline ORCHARD_DLL [--rounds N]] [--json FILE]
                                                          configuration checks, edge checks and IK solves per second
          bench moves [--trees N] [--endpoints clear|pre-cut] [--planners A,B] [--verify] [--json FILE]
                                                          every planner variant on the same demo moves
          bench sequencing [--tsplib DIR] [--json FILE] [--seconds S] [--solution-limit N] [--first-solution NAME]
                                                          TSPLIB tours, closed and open from node 1, against proven optima
          bench trees [--trees N] [--dense N] [--keep-moot] [--no-all-pairs] [--json FILE]
                                                          scan → schedule: lazy, all-pairs, naive sweep; --dense adds cuts up to N per tree
          bench coverage [--seeds a,b,c] [--trees-per-row N] [--max-stops N] [--clearance-target-mm N] [--max-retreat-mm N] [--no-falling-wood] [--json FILE]
                                                          share of eligible cuts scheduled, per tree and seed
          bench load [--get-rate N] [--post-rate N] [--seconds N] [--warmup-seconds N] [--connections N]
                     [--seed-trees N] [--postgres CONN] [--baseline ORCHARD_DLL] [--json FILE]
                                                          fixed-rate GET schedule and POST scan against an API process
          serve [--urls URL] [--Orchard:PostgresConnectionString=...]  the API, with a planning worker
          worker [--Orchard:PostgresConnectionString=...]    planning workers only
          help                                            this text
        """;

    public static async Task<int> RunAsync(string[] args, TextWriter stdout, TextWriter stderr, CancellationToken cancellationToken)
    {
        try
        {
            var verb = args.Length == 0 ? "help" : args[0];
            var rest = args.Skip(1);
            return verb switch
            {
                "demo" => await DemoVerb.RunAsync(rest, stdout, cancellationToken),
                "plan" => await PlanVerb.RunAsync(rest, stdout, stderr, cancellationToken),
                "serve" => await ServeVerb.RunAsync(rest.ToArray(), withApi: true, cancellationToken),
                "worker" => await ServeVerb.RunAsync(rest.ToArray(), withApi: false, cancellationToken),
                "bench" => await BenchAsync(rest.ToList(), stdout, cancellationToken),
                "help" or "--help" or "-h" => Help(stdout),
                _ => throw new UsageException($"Unknown verb '{verb}'."),
            };
        }
        catch (UsageException ex)
        {
            await stderr.WriteLineAsync($"orchard: {ex.Message}");
            await stderr.WriteLineAsync(Usage);
            return 2;
        }
        catch (CliFileException ex)
        {
            await stderr.WriteLineAsync($"orchard: {ex.Message}");
            return 1;
        }
    }

    private static async Task<int> BenchAsync(List<string> words, TextWriter stdout, CancellationToken cancellationToken)
    {
        if (words is ["sequencing", .. var sequencingWords])
        {
            return await BenchSequencingVerb.RunAsync(sequencingWords, stdout, cancellationToken);
        }

        var args = new CliArguments(words.Skip(1), new HashSet<string> { "verify", "no-all-pairs", "no-falling-wood", "keep-moot" });
        return words.FirstOrDefault() switch
        {
            "checks" => await BenchChecksVerb.RunAsync(args, stdout, cancellationToken),
            "moves" => await BenchMovesVerb.RunAsync(args, stdout, cancellationToken),
            "trees" => await BenchTreesVerb.RunAsync(args, stdout, cancellationToken),
            "coverage" => await BenchCoverageVerb.RunAsync(args, stdout, cancellationToken),
            "load" => await BenchLoadVerb.RunAsync(args, stdout, cancellationToken),
            null => throw new UsageException("bench needs a benchmark name: checks, moves, sequencing, trees, coverage or load."),
            var other => throw new UsageException($"Unknown benchmark '{other}'; there are: checks, moves, sequencing, trees, coverage, load."),
        };
    }

    private static int Help(TextWriter stdout)
    {
        stdout.WriteLine(Usage);
        return 0;
    }
}
