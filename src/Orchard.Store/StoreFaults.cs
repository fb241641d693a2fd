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
    public static bool IsTransient(Exception? error)
    {
        for (var e = error; e is not null; e = e.InnerException)
        {
            if (e is DbException or TimeoutException or SocketException or IOException)
            {
                return true;
            }
        }

        return false;
    }
}
