using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>
/// The review cookie is the page's only: it reads the page's GET endpoints and signs out, nothing more; an
/// admin key signs in as a manager; sign-in and sign-out come only from the page (Origin or Sec-Fetch-Site,
/// and its antiforgery token); sign-out ends the session on the server; revoking or expiring a key ends its
/// sessions and its use. Keys are listed with their last use and audited; bodies must be JSON.
/// </summary>
public abstract class ReviewSessionTests
{
    protected abstract Task<ServiceUnderTest> StartAsync();

    [Fact]
    public async Task The_cookie_reads_the_pages_endpoints_and_nothing_else_and_admin_keys_sign_in_as_managers()
    {
        await using var service = await StartAsync();
        using var page = new PageClient(service.Http.BaseAddress!);
        using (var signIn = await page.SignInAsync(service.Keys["admin"]))
        {
            Assert.Equal(HttpStatusCode.Redirect, signIn.StatusCode);
            Assert.Equal("/review/", signIn.Headers.Location!.ToString());
        }

        var session = await page.SessionAsync();
        Assert.Equal((true, "manager"), (session.GetProperty("signedIn").GetBoolean(), session.GetProperty("role").GetString()));
        foreach (var path in new[] { "/api/v1/trees", "/api/v1/estimates", "/api/v1/estimates.csv", "/api/v1/jobs/job-none" })
        {
            using var read = await page.Http.GetAsync(new Uri(path, UriKind.Relative));
            Assert.True(read.StatusCode is HttpStatusCode.OK or HttpStatusCode.NotFound, $"{path}: {read.StatusCode}");
        }

        // An admin's session has a manager's rights: no admin reads, and no unsafe call at all.
        using (var admin = await page.Http.GetAsync(new Uri("/api/v1/api-keys", UriKind.Relative)))
        {
            Assert.Equal(HttpStatusCode.Forbidden, admin.StatusCode);
        }

        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        foreach (var (method, path) in new[] { ("POST", "/api/v1/scans"), ("POST", "/api/v1/trees/K1-001/outcomes"), ("POST", "/api/v1/api-keys"), ("PUT", "/api/v1/arm-profiles/x"), ("DELETE", "/api/v1/api-keys/key-x") })
        {
            using var request = new HttpRequestMessage(new HttpMethod(method), path) { Content = method == "DELETE" ? null : ServiceUnderTest.Json(DemoScans.Json(0, cuts: 2)) };
            using var response = await page.Http.SendAsync(request);
            Assert.True(response.StatusCode == HttpStatusCode.Unauthorized, $"{method} {path} with the cookie: {response.StatusCode}");
        }

        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));
    }

    [Fact]
    public async Task Sign_in_and_sign_out_are_accepted_only_from_the_page_with_its_token()
    {
        await using var service = await StartAsync();
        using var page = new PageClient(service.Http.BaseAddress!);
        var otherPort = new UriBuilder(service.Http.BaseAddress!) { Port = service.Http.BaseAddress!.Port + 1 }.Uri.GetLeftPart(UriPartial.Authority);
        foreach (var (origin, site, token, expected) in new (string?, string?, bool, HttpStatusCode)[]
        {
            (otherPort, "same-site", true, HttpStatusCode.Forbidden),
            (otherPort, null, true, HttpStatusCode.Forbidden),
            (null, "same-site", true, HttpStatusCode.Forbidden),
            (null, "cross-site", true, HttpStatusCode.Forbidden),
            ("null", null, true, HttpStatusCode.Forbidden),
            (null, null, true, HttpStatusCode.Forbidden),
            ("", "same-origin", false, HttpStatusCode.BadRequest),
        })
        {
            using var refused = await page.SignInAsync(service.Keys["manager"], origin, site, token);
            Assert.True(expected == refused.StatusCode, $"Origin {origin ?? "(none)"}, Sec-Fetch-Site {site ?? "(none)"}, token {token}: {refused.StatusCode}");
            Assert.Equal("application/problem+json", refused.Content.Headers.ContentType?.MediaType);
            Assert.Null(page.SessionCookie);
        }

        // From the page (either header alone will do), it works; a forged sign-out does nothing.
        using (var ok = await page.SignInAsync(service.Keys["manager"], origin: null, fetchSite: "same-origin"))
        {
            Assert.Equal(HttpStatusCode.Redirect, ok.StatusCode);
        }

        var cookie = page.SessionCookie!;
        using (var forged = await page.SignOutAsync(otherPort, "same-site"))
        {
            Assert.Equal(HttpStatusCode.Forbidden, forged.StatusCode);
        }

        Assert.Equal(HttpStatusCode.OK, await page.GetWithCookieAsync("/api/v1/trees", cookie));

        // Sign-out ends the session on the server: the old cookie, replayed, no longer works.
        using (var signOut = await page.SignOutAsync())
        {
            Assert.Equal(HttpStatusCode.Redirect, signOut.StatusCode);
        }

        Assert.False((await page.SessionAsync()).GetProperty("signedIn").GetBoolean());
        Assert.Equal(HttpStatusCode.Unauthorized, await page.GetWithCookieAsync("/api/v1/trees", cookie));
        using var audit = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/audit", "admin"));
        var actions = (await audit.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray().Select(a => a.GetProperty("action").GetString()).ToList();
        Assert.Contains("session.signedIn", actions);
        Assert.Contains("session.signedOut", actions);
    }

    [Fact]
    public async Task Revoking_a_key_ends_its_use_and_its_sessions_and_expired_keys_stop_by_themselves()
    {
        await using var service = await StartAsync();
        using var page = new PageClient(service.Http.BaseAddress!);
        using (await page.SignInAsync(service.Keys["manager"]))
        {
        }

        var cookie = page.SessionCookie!;
        Assert.Equal(HttpStatusCode.OK, await page.GetWithCookieAsync("/api/v1/trees", cookie));
        using (var listed = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager")))
        {
            Assert.Equal(HttpStatusCode.OK, listed.StatusCode);
        }

        // The listing shows each key's last use, never a secret.
        using var keysResponse = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/api-keys", "admin"));
        var keysText = await keysResponse.Content.ReadAsStringAsync();
        Assert.DoesNotContain(service.Keys["manager"], keysText, StringComparison.Ordinal);
        Assert.DoesNotContain("secret", keysText, StringComparison.OrdinalIgnoreCase);
        var manager = JsonDocument.Parse(keysText).RootElement.EnumerateArray().Single(k => k.GetProperty("role").GetString() == "manager");
        Assert.NotEqual(JsonValueKind.Null, manager.GetProperty("lastUsedAt").ValueKind);

        var keyId = manager.GetProperty("keyId").GetString()!;
        using (var revoke = await service.Http.SendAsync(service.Request(HttpMethod.Delete, $"/api/v1/api-keys/{keyId}", "admin")))
        {
            Assert.Equal(HttpStatusCode.NoContent, revoke.StatusCode);
        }

        using (var again = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager")))
        {
            Assert.Equal(HttpStatusCode.Unauthorized, again.StatusCode);
        }

        Assert.Equal(HttpStatusCode.Unauthorized, await page.GetWithCookieAsync("/api/v1/trees", cookie));

        // The last usable admin key stays.
        using var adminKeys = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/api-keys", "admin"));
        var adminId = (await adminKeys.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray().Single(k => k.GetProperty("role").GetString() == "admin").GetProperty("keyId").GetString();
        using (var last = await service.Http.SendAsync(service.Request(HttpMethod.Delete, $"/api/v1/api-keys/{adminId}", "admin")))
        {
            Assert.Equal(HttpStatusCode.Conflict, last.StatusCode);
        }

        // A key that expires: refused in the past, working until its time, then refused like an unknown one.
        using (var past = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/api-keys", "admin", JsonContent.Create(new { role = "tablet", expiresAt = DateTimeOffset.UtcNow.AddMinutes(-1) }))))
        {
            Assert.Equal(HttpStatusCode.UnprocessableEntity, past.StatusCode);
            Assert.Contains("$.expiresAt", await past.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        }

        using var made = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/api-keys", "admin", JsonContent.Create(new { role = "tablet", label = "short-lived", expiresAt = DateTimeOffset.UtcNow.AddSeconds(2) })));
        Assert.Equal(HttpStatusCode.Created, made.StatusCode);
        Assert.Equal("no-store", made.Headers.CacheControl!.ToString());
        service.Keys["short"] = (await made.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("secret").GetString()!;
        using (var works = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "short")))
        {
            Assert.Equal(HttpStatusCode.NotFound, works.StatusCode);
        }

        await Task.Delay(TimeSpan.FromSeconds(2.5));
        using (var expired = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "short")))
        {
            Assert.Equal(HttpStatusCode.Unauthorized, expired.StatusCode);
        }

        using var audit = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/audit?limit=50", "admin"));
        var lines = (await audit.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray().ToList();
        Assert.Contains(lines, l => l.GetProperty("action").GetString() == "key.revoked" && l.GetProperty("target").GetString() == keyId);
        Assert.Contains(lines, l => l.GetProperty("action").GetString() == "key.created" && l.GetProperty("detail").GetString()!.Contains("short-lived", StringComparison.Ordinal));
    }
}

/// <summary>The session, key and cookie rules on the embedded store.</summary>
public sealed class SqliteReviewSessionTests : ReviewSessionTests
{
    protected override Task<ServiceUnderTest> StartAsync() => ServiceUnderTest.StartAsync();
}

/// <summary>The same on PostgreSQL (sessions, keys and the key ring are kept in the store).</summary>
public sealed class PostgresReviewSessionTests(Orchard.Store.Tests.PostgresServer server) : ReviewSessionTests, IClassFixture<Orchard.Store.Tests.PostgresServer>
{
    protected override async Task<ServiceUnderTest> StartAsync() => await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync());
}

/// <summary>Every API request with a body must declare it JSON; anything else gets 415 naming the header and changes nothing.</summary>
public sealed class JsonBodyTests
{
    [Theory]
    [InlineData("text/plain")]
    [InlineData("application/x-www-form-urlencoded")]
    [InlineData("multipart/form-data; boundary=x")]
    [InlineData("application/json; charset=iso-8859-1")]
    [InlineData(null)]
    public async Task A_body_that_is_not_declared_json_is_refused_with_415(string? contentType)
    {
        await using var service = await ServiceUnderTest.StartAsync();
        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        foreach (var (path, role) in new[] { ("/api/v1/scans", "tablet"), ("/api/v1/trees/K1-001/outcomes", "controller"), ("/api/v1/api-keys", "admin") })
        {
            using var content = new ByteArrayContent(System.Text.Encoding.UTF8.GetBytes(DemoScans.Json(0, cuts: 2)));
            if (contentType is not null)
            {
                content.Headers.TryAddWithoutValidation("Content-Type", contentType);
            }

            using var response = await service.Http.SendAsync(service.Request(HttpMethod.Post, path, role, content));
            Assert.Equal(HttpStatusCode.UnsupportedMediaType, response.StatusCode);
            var error = (await response.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("errors")[0];
            Assert.Equal("$header.Content-Type", error.GetProperty("path").GetString());
        }

        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));
    }
}

/// <summary>Replicas on one PostgreSQL share the cookie key ring (kept in the store): a session opened on one is honoured by another.</summary>
public sealed class ReplicaSessionTests(Orchard.Store.Tests.PostgresServer server) : IClassFixture<Orchard.Store.Tests.PostgresServer>
{
    [Fact]
    public async Task A_cookie_from_one_replica_is_accepted_by_another_and_sign_out_on_it_ends_it_everywhere()
    {
        var database = await server.CreateDatabaseAsync();
        await using var first = await ServiceUnderTest.StartAsync(database);
        await using var second = await ServiceUnderTest.StartAsync(database);
        using var page = new PageClient(first.Http.BaseAddress!);
        using (var signIn = await page.SignInAsync(first.Keys["manager"]))
        {
            Assert.Equal(HttpStatusCode.Redirect, signIn.StatusCode);
        }

        var cookie = page.SessionCookie!;
        using var onSecond = new PageClient(second.Http.BaseAddress!);
        Assert.Equal(HttpStatusCode.OK, await onSecond.GetWithCookieAsync("/api/v1/trees", cookie));

        using (await page.SignOutAsync())
        {
        }

        Assert.Equal(HttpStatusCode.Unauthorized, await onSecond.GetWithCookieAsync("/api/v1/trees", cookie));
    }
}
