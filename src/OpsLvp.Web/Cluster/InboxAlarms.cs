using System.Globalization;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// The reading inbox's on-screen alarms (docs/engine.md R81, R82), kept by the leader's <see cref="ReadingInboxDrain"/>
/// and shown by the engine host with its other host alarms on every screen of every node:
/// <list type="bullet">
/// <item><c>inbox-behind</c> while the oldest waiting batch is older than <c>Cluster:InboxAlarmAfter</c>, cleared as
/// soon as it is not (one alarm, its text follows the count: no flood);</item>
/// <item><c>inbox-batch-set-aside</c> when a failing batch was set aside, shown for <see cref="SetAsideShownFor"/> after
/// the last one (its text names the last batch and how many were set aside; each has its audit entry). A batch set
/// aside while it shows updates its text and keeps its time, so a screen's chime sounds once, not once a batch.</item>
/// </list>
/// In memory on the node that leads, like the clock and retention alarms: a new leader starts without them.
/// </summary>
public sealed class InboxAlarms
{
    public const string BehindKey = "inbox-behind";

    public const string SetAsideKey = "inbox-batch-set-aside";

    /// <summary>How long the set-aside alarm stays on the screens after the last batch was set aside.</summary>
    public static readonly TimeSpan SetAsideShownFor = TimeSpan.FromMinutes(30);

    private readonly Lock _lock = new();
    private Alarm? _behind;
    private Alarm? _setAside;
    private long _setAsideCount;
    private DateTimeOffset _lastSetAsideAt;

    /// <summary>Batches this node set aside since its start.</summary>
    public long SetAsideCount
    {
        get
        {
            lock (_lock)
            {
                return _setAsideCount;
            }
        }
    }

    /// <summary>The alarms to show at <paramref name="now"/> (engine clock).</summary>
    public IReadOnlyList<Alarm> Current(DateTimeOffset now)
    {
        lock (_lock)
        {
            var alarms = new List<Alarm>(2);
            if (_behind is { } behind)
            {
                alarms.Add(behind);
            }
            if (_setAside is { } setAside && now - _lastSetAsideAt < SetAsideShownFor)
            {
                alarms.Add(setAside);
            }
            return alarms;
        }
    }

    /// <summary>
    /// <paramref name="batches"/> wait, the oldest received at <paramref name="oldest"/> on <paramref name="node"/>:
    /// raises (or updates the text of) the behind alarm, keeping the time it was first raised.
    /// </summary>
    public void Behind(int batches, DateTimeOffset oldest, string node, DateTimeOffset now)
    {
        var message = string.Create(CultureInfo.InvariantCulture,
            $"{batches} reading batch(es) pushed to other nodes not yet evaluated, the oldest received on {node} at {Clock(oldest, now)}; the screens do not show those readings yet");
        lock (_lock)
        {
            _behind = _behind is { } raised ? raised with { Message = message } : new Alarm(BehindKey, AlarmKind.InboxBehind, message, now);
        }
    }

    /// <summary>Nothing waits longer than the threshold (or this node no longer leads).</summary>
    public void NotBehind()
    {
        lock (_lock)
        {
            _behind = null;
        }
    }

    /// <summary>A batch was set aside (its audit entry committed): raises the set-aside alarm naming it.</summary>
    public void SetAside(long inboxId, string node, DateTimeOffset receivedAt, int readings, string error, DateTimeOffset now)
    {
        lock (_lock)
        {
            _setAsideCount++;
            var more = _setAsideCount > 1 ? string.Create(CultureInfo.InvariantCulture, $" ({_setAsideCount} set aside since this node started)") : "";
            var message = string.Create(CultureInfo.InvariantCulture,
                $"reading batch {inboxId} received on {node} at {Clock(receivedAt, now)} ({readings} reading(s)) was set aside and will not be evaluated: {error}{more}; its content is in the audit entry inbox_batch_set_aside");
            var shown = _setAside is not null && now - _lastSetAsideAt < SetAsideShownFor;
            _setAside = shown ? _setAside! with { Message = message } : new Alarm(SetAsideKey, AlarmKind.InboxBatchSetAside, message, now);
            _lastSetAsideAt = now;
        }
    }

    /// <summary>A time as an operations room reads it: <c>hh:mm:ssZ</c>, with the UTC date in front when it is not <paramref name="now"/>'s day.</summary>
    internal static string Clock(DateTimeOffset at, DateTimeOffset now) =>
        at.UtcDateTime.Date == now.UtcDateTime.Date ? DisplayFormat.UtcClockSeconds(at) : DisplayFormat.UtcDateTime(at);
}
