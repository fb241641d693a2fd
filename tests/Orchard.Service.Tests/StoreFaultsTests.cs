using System.Net.Sockets;
using Microsoft.AspNetCore.Http;
using Microsoft.Data.Sqlite;
using Npgsql;
using Orchard.Store;

namespace Orchard.Service.Tests;

/// <summary>Which errors are a passing store fault (503, try again) and which are not.</summary>
public sealed class StoreFaultsTests
{
    [Fact]
    public void Database_errors_and_their_wrapped_causes_are_transient()
    {
        Assert.True(StoreFaults.IsTransient(new NpgsqlException("Exception while reading from stream", new IOException("reset", new SocketException(104)))));
        Assert.True(StoreFaults.IsTransient(new SqliteException("database is locked", 5)));
        Assert.True(StoreFaults.IsTransient(new InvalidOperationException("wrapped", new NpgsqlException("Failed to connect"))));
        Assert.True(StoreFaults.IsTransient(new TimeoutException()));
        Assert.True(StoreFaults.IsTransient(new SocketException(111)));
    }

    [Fact]
    public void Bad_requests_and_bugs_are_not()
    {
        // BadHttpRequestException is an IOException: an oversize body must stay a 413, never a 503.
        Assert.False(StoreFaults.IsTransient(new BadHttpRequestException("Request body too large.", 413)));
        Assert.False(StoreFaults.IsTransient(new IOException("client went away", new SocketException(104))));
        Assert.False(StoreFaults.IsTransient(new InvalidOperationException("a bug")));
        Assert.False(StoreFaults.IsTransient(new OperationCanceledException()));
        Assert.False(StoreFaults.IsTransient(null));
    }
}
