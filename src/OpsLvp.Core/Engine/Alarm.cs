namespace OpsLvp.Core.Engine;

/// <summary>A raised alarm. <paramref name="Key"/> identifies its cause (e.g. "feed-silent:RVR09T").</summary>
public sealed record Alarm(string Key, AlarmKind Kind, string Message, DateTimeOffset RaisedAt, string? AcknowledgedBy = null, DateTimeOffset? AcknowledgedAt = null)
{
    public bool Acknowledged => AcknowledgedBy is not null;
}
