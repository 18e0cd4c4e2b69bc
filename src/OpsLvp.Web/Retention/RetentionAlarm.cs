using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Retention;

/// <summary>
/// The on-screen alarm of a failing readings prune (docs/retention.md "When a run fails", docs/engine.md R78): raised by
/// <see cref="ReadingsRetentionService"/> when a run fails to export, record or delete, shown by the engine host with
/// its other host alarms on every screen of every node, acknowledgeable like an engine alarm, and cleared when a later
/// run succeeds. Kept in memory on the node that leads: a restart or a new leader raises it again at its first failing run.
/// </summary>
public sealed class RetentionAlarm
{
    /// <summary>The alarm's key (stable: acknowledgements and the audit entries use it).</summary>
    public const string Key = "retention-failing";

    private readonly Lock _lock = new();
    private Alarm? _current;

    /// <summary>The alarm while raised, else null.</summary>
    public Alarm? Current
    {
        get
        {
            lock (_lock)
            {
                return _current;
            }
        }
    }

    /// <summary>Raises the alarm for <paramref name="failure"/>; true when it was not raised before. A new reason replaces the text, keeping the time and any acknowledgement.</summary>
    public bool Raise(string failure, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(failure);
        lock (_lock)
        {
            var message = failure.StartsWith("readings not pruned", StringComparison.Ordinal) ? failure : "readings not pruned: " + failure;
            if (_current is { } raised)
            {
                _current = raised with { Message = message };
                return false;
            }
            _current = new Alarm(Key, AlarmKind.RetentionFailing, message, at);
            return true;
        }
    }

    /// <summary>Clears the alarm; the alarm as it was when it was raised, else null.</summary>
    public Alarm? Clear()
    {
        lock (_lock)
        {
            var was = _current;
            _current = null;
            return was;
        }
    }

    /// <summary>Null when it may be acknowledged now; else why not (not raised, or acknowledged already).</summary>
    public string? CannotAcknowledge()
    {
        lock (_lock)
        {
            return _current switch
            {
                null => $"alarm '{Key}' is not raised",
                { Acknowledged: true } a => $"alarm '{Key}' already acknowledged by {a.AcknowledgedBy} at {OpsLvp.Core.Audit.AuditCanonical.FormatTime(a.AcknowledgedAt!.Value)}",
                _ => null,
            };
        }
    }

    /// <summary>Marks the raised alarm acknowledged (after the audit entry for it was committed).</summary>
    public void Acknowledge(string actor, DateTimeOffset at)
    {
        lock (_lock)
        {
            if (_current is { Acknowledged: false } a)
            {
                _current = a with { AcknowledgedBy = actor, AcknowledgedAt = at };
            }
        }
    }
}
