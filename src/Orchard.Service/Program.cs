using Orchard.Service.Cli;

// One executable, several verbs; see `orchard help`.
return await CommandLine.RunAsync(args, Console.Out, Console.Error, CancellationToken.None);
