using Orchard.Service.Cli;

namespace Orchard.Service.Tests;

/// <summary>
/// docker-compose.yml parses (a small reader for the block-style YAML subset the file uses: nested
/// mappings by indentation, lists, scalars) and wires PostgreSQL, the API and workers to the same
/// store; the container file runs the same executable with the verbs the compose file asks for.
/// </summary>
public sealed class DeploymentFilesTests
{
    [Fact]
    public void The_compose_file_has_postgres_api_and_workers_sharing_one_store()
    {
        var compose = MiniYaml.Parse(File.ReadAllLines(Path.Combine(Root(), "docker-compose.yml")));
        var services = (Dictionary<string, object>)compose["services"];
        Assert.Equal(["api", "postgres", "worker"], services.Keys.Order(StringComparer.Ordinal));
        var postgres = (Dictionary<string, object>)services["postgres"];
        Assert.True(postgres.ContainsKey("healthcheck"));
        foreach (var (name, verb) in new[] { ("api", "serve"), ("worker", "worker") })
        {
            var service = (Dictionary<string, object>)services[name];
            var build = (Dictionary<string, object>)service["build"];
            Assert.Equal("deploy/Containerfile", build["dockerfile"]);
            Assert.Contains(verb, (string)service["command"], StringComparison.Ordinal);
            var environment = (Dictionary<string, object>)service["environment"];
            Assert.Contains("Host=postgres", (string)environment["Orchard__PostgresConnectionString"], StringComparison.Ordinal);
        }

        Assert.True(((Dictionary<string, object>)services["worker"]).ContainsKey("deploy"));
    }

    [Fact]
    public async Task The_container_runs_the_same_executable_and_its_verbs_exist()
    {
        var containerfile = await File.ReadAllTextAsync(Path.Combine(Root(), "deploy", "Containerfile"));
        Assert.Contains("ENTRYPOINT [\"dotnet\", \"orchard.dll\"]", containerfile, StringComparison.Ordinal);
        Assert.Contains("src/Orchard.Service/Orchard.Service.csproj", containerfile, StringComparison.Ordinal);
        using var output = new StringWriter();
        Assert.Equal(0, await CommandLine.RunAsync(["help"], output, TextWriter.Null, CancellationToken.None));
        foreach (var verb in new[] { "serve", "worker", "demo", "plan" })
        {
            Assert.Contains("  " + verb, output.ToString(), StringComparison.Ordinal);
        }
    }

    [Fact]
    public void The_kubernetes_manifests_have_probes_resources_secrets_and_an_autoscaler()
    {
        var folder = Path.Combine(Root(), "deploy", "k8s");
        var documents = Directory.GetFiles(folder, "*.yaml")
            .SelectMany(f => string.Join('\n', File.ReadAllLines(f)).Split("\n---\n"))
            .Select(d => MiniYaml.Parse(d.Split('\n')))
            .ToList();
        string Kind(Dictionary<string, object> d) => (string)d["kind"];
        string Name(Dictionary<string, object> d) => (string)((Dictionary<string, object>)d["metadata"])["name"];
        Assert.Contains(documents, d => Kind(d) == "Secret");
        Assert.Contains(documents, d => Kind(d) == "Service" && Name(d) == "orchard-api");
        var hpa = Assert.Single(documents, d => Kind(d) == "HorizontalPodAutoscaler");
        Assert.Equal("orchard-worker", ((Dictionary<string, object>)((Dictionary<string, object>)hpa["spec"])["scaleTargetRef"])["name"]);
        foreach (var name in new[] { "orchard-api", "orchard-worker" })
        {
            var deployment = Assert.Single(documents, d => Kind(d) == "Deployment" && Name(d) == name);
            var text = File.ReadAllText(Directory.GetFiles(folder, "*.yaml").Single(f => File.ReadAllText(f).Contains($"name: {name}\n  labels", StringComparison.Ordinal)));
            foreach (var needed in new[] { "startupProbe:", "livenessProbe:", "readinessProbe:", "requests:", "secretKeyRef:", "/health/ready" })
            {
                Assert.Contains(needed, text, StringComparison.Ordinal);
            }

            Assert.NotNull(deployment["spec"]);
        }
    }

    private static string Root()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "Orchard.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("Orchard.sln not found");
    }

    /// <summary>Block-style YAML: "key: value", "key:" opening a nested mapping, "- item" lists (kept as text), comments.</summary>
    private static class MiniYaml
    {
        public static Dictionary<string, object> Parse(string[] lines)
        {
            var root = new Dictionary<string, object>(StringComparer.Ordinal);
            var stack = new Stack<(int Indent, Dictionary<string, object> Map)>();
            stack.Push((-1, root));
            string? lastKey = null;
            (Dictionary<string, object> Parent, string Key)? opened = null;
            foreach (var raw in lines)
            {
                var line = raw.Split(" #")[0].TrimEnd();
                if (line.TrimStart().StartsWith('#') || line.Trim().Length == 0)
                {
                    continue;
                }

                var indent = line.Length - line.TrimStart().Length;
                Assert.True(indent % 2 == 0, $"odd indentation: '{raw}'");
                var text = line.Trim();
                while (stack.Peek().Indent >= indent)
                {
                    stack.Pop();
                }

                var map = stack.Peek().Map;
                if (text.StartsWith("- ", StringComparison.Ordinal) && opened is { } list && map.Count == 0 && ReferenceEquals(list.Parent[list.Key], map))
                {
                    // "key:" followed by list items: the key holds the list, not a mapping.
                    stack.Pop();
                    map = list.Parent;
                    lastKey = list.Key;
                    map[lastKey] = string.Empty;
                    opened = null;
                }

                if (text.StartsWith("- ", StringComparison.Ordinal))
                {
                    Assert.NotNull(lastKey);
                    map[lastKey!] = map.TryGetValue(lastKey!, out var existing) && existing is string { Length: > 0 } s ? s + "\n" + text[2..] : text[2..];
                    continue;
                }

                var colon = text.IndexOf(':', StringComparison.Ordinal);
                Assert.True(colon > 0, $"not a key: '{raw}'");
                var key = text[..colon].Trim();
                var value = text[(colon + 1)..].Trim().Trim('"');
                if (value.Length == 0)
                {
                    var child = new Dictionary<string, object>(StringComparer.Ordinal);
                    map[key] = child;
                    stack.Push((indent, child));
                    opened = (map, key);
                    lastKey = null;
                    continue;
                }

                map[key] = value;
                lastKey = key;
            }

            return root;
        }
    }
}
