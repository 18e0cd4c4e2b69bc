using OpsLvp.Core.Readings;

namespace OpsLvp.Data.Stores;

/// <summary>
/// A reading as received, for the <c>readings</c> table (every reading is kept, accepted or not; docs/engine.md R1).
/// Fields that could not be parsed are null (<see cref="Time"/>, <see cref="Value"/>, <see cref="Status"/>) or the
/// raw text (<see cref="Kind"/>); an accepted reading has all of them and no reject reason.
/// </summary>
public sealed record ReceivedReading(
    DateTimeOffset ReceivedAt,
    string Source,
    string Sensor,
    string Kind,
    DateTimeOffset? Time,
    double? Value,
    string? Status,
    bool Accepted,
    RejectReason? RejectReason = null,
    string? RejectDetail = null)
{
    public static ReceivedReading Accept(Reading reading, DateTimeOffset receivedAt, string source)
    {
        ArgumentNullException.ThrowIfNull(reading);
        return new(receivedAt, source, reading.SensorId, reading.Kind.ToString(), reading.Time, reading.Value, reading.Status.ToString(), true);
    }

    /// <summary>True for RVR the host derived from a raw reading and stored (source ending ":derived").</summary>
    public bool IsDerived => Source.EndsWith(":derived", StringComparison.Ordinal);

    /// <summary>The reading as it was received, or null when its time, value, kind or status could not be parsed.</summary>
    public Reading? AsReading() =>
        Time is { } time && Value is { } value && Enum.TryParse<ReadingKind>(Kind, out var kind) && Enum.TryParse<ReadingStatus>(Status, out var status)
            ? new Reading(time, Sensor, kind, value, status)
            : null;

    public static ReceivedReading Reject(Reading reading, DateTimeOffset receivedAt, string source, RejectReason reason, string? detail = null)
    {
        ArgumentNullException.ThrowIfNull(reading);
        return new(receivedAt, source, reading.SensorId, reading.Kind.ToString(), reading.Time, reading.Value, reading.Status.ToString(), false, reason, detail);
    }
}
