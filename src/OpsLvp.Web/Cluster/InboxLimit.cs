using System.Globalization;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// Pushes a standby refused because the reading inbox held <c>Cluster:InboxMaxBatches</c> (docs/engine.md R80): counted
/// for <c>/health</c> and logged at most once per <see cref="LogEvery"/> with how many were refused meanwhile, so a
/// feed retrying against a full inbox does not flood the log.
/// </summary>
public sealed class InboxLimit
{
    /// <summary>The shortest time between two warnings about a full inbox.</summary>
    public static readonly TimeSpan LogEvery = TimeSpan.FromSeconds(30);

    private readonly Lock _lock = new();
    private long _refused;
    private long _refusedSinceLog;
    private DateTimeOffset _lastLog = DateTimeOffset.MinValue;

    /// <summary>Pushes this node refused because the inbox was full, since its start.</summary>
    public long Refused
    {
        get
        {
            lock (_lock)
            {
                return _refused;
            }
        }
    }

    /// <summary>Counts one refusal; logs it when no warning was logged for <see cref="LogEvery"/> (<paramref name="realNow"/>: the real clock).</summary>
    public void Refuse(string source, string node, int waiting, int max, DateTimeOffset realNow, ILogger logger)
    {
        long meanwhile;
        lock (_lock)
        {
            _refused++;
            _refusedSinceLog++;
            if (realNow - _lastLog < LogEvery)
            {
                return;
            }
            meanwhile = _refusedSinceLog;
            _refusedSinceLog = 0;
            _lastLog = realNow;
        }
        logger.LogWarning("Reading inbox full on {Node}: {Waiting} batch(es) wait for the leader (Cluster:InboxMaxBatches {Max}); push from {Source} refused with 503, {Refused} push(es) refused since the last warning",
            node, waiting, max, source, meanwhile.ToString(CultureInfo.InvariantCulture));
    }
}
