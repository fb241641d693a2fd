using System.Text.Json;
using System.Text.Json.Nodes;

namespace Orchard.Service.Tests;

/// <summary>The OpenAPI document the service serves is the one checked in at api/openapi.json.</summary>
public sealed class OpenApiDocumentTests
{
    [Fact]
    public async Task The_served_document_matches_the_checked_in_one()
    {
        await using var service = await ServiceUnderTest.StartAsync();
        var served = await service.Http.GetStringAsync(new Uri("/openapi/v1.json", UriKind.Relative));
        var file = Path.Combine(RepositoryRoot(), "api", "openapi.json");
        Assert.True(File.Exists(file), $"api/openapi.json is missing at {file}");
        var checkedIn = await File.ReadAllTextAsync(file);
        Assert.True(
            JsonNode.DeepEquals(JsonNode.Parse(served), JsonNode.Parse(checkedIn)),
            "The served OpenAPI document differs from api/openapi.json; regenerate it (see DEVELOPERS.md).");
        using var doc = JsonDocument.Parse(served);
        Assert.True(doc.RootElement.GetProperty("paths").TryGetProperty("/api/v1/scans", out _));
    }

    private static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "Orchard.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("Orchard.sln not found above " + AppContext.BaseDirectory);
    }
}
