using Npgsql;

namespace OpsLvp.Web.Engine;

/// <summary>
/// Reading batches from the inbox were refused by the database for their own content (a data or integrity error,
/// SQLSTATE classes 22 and 23), not because storage fails: nothing was written and recording goes on; the drain tries
/// the head batch alone and sets it aside after <c>Cluster:InboxSetAsideAfter</c> attempts (docs/engine.md R82).
/// </summary>
public sealed class InboxBatchFaultException(string message, Exception inner) : Exception(message, inner)
{
    /// <summary>True when <paramref name="ex"/> (or an exception inside it) is PostgreSQL refusing the data itself.</summary>
    public static bool IsBatchFault(Exception ex)
    {
        for (var e = ex; e is not null; e = e.InnerException)
        {
            if (e is PostgresException { SqlState: { } state } && (state.StartsWith("22", StringComparison.Ordinal) || state.StartsWith("23", StringComparison.Ordinal)))
            {
                return true;
            }
        }
        return false;
    }
}
