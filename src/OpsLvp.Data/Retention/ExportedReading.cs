using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data.Entities;

namespace OpsLvp.Data.Retention;

/// <summary>One reading as written to, and read back from, a readings export file (docs/retention.md).</summary>
public sealed record ExportedReading(
    long Id,
    DateTimeOffset ReceivedAt,
    string Source,
    string Sensor,
    string Kind,
    DateTimeOffset? Time,
    double? Value,
    string? Status,
    bool Accepted,
    string? RejectReason,
    string? RejectDetail)
{
    public static ExportedReading From(ReadingRow r) =>
        new(r.Id, r.ReceivedAt, r.Source, r.Sensor, r.Kind, r.Time, r.Value, r.Status, r.Accepted, r.RejectReason, r.RejectDetail);

    /// <summary>Adds this reading to a covered-readings digest (docs/audit.md "Readings covered").</summary>
    public void AddTo(ReadingsDigest digest) =>
        digest.Add(Id, ReceivedAt, Source, Sensor, Kind, Time, Value, Status, Accepted, RejectReason, RejectDetail);
}
