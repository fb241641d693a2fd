using System.Data.Common;
using System.Net.Sockets;

namespace Orchard.Store;

/// <summary>
/// Tells a passing store fault (the database restarting, a dropped connection, a timeout) from a bug.
/// Callers answer the first with "try again" (503 + Retry-After, or a worker backing off and leaving its
/// job to the queue) and never record it as a failed plan.
/// </summary>
public static class StoreFaults
{
    /// <remarks>
    /// A database error anywhere in the chain counts (both providers wrap socket and stream failures in
    /// their DbException); a timeout or socket error counts only on its own. A bare I/O error does not:
    /// ASP.NET Core's BadHttpRequestException (an oversize or broken request body) is one.
    /// </remarks>
    public static bool IsTransient(Exception? error)
    {
        if (error is TimeoutException or SocketException)
        {
            return true;
        }

        for (var e = error; e is not null; e = e.InnerException)
        {
            if (e is DbException)
            {
                return true;
            }
        }

        return false;
    }
}
