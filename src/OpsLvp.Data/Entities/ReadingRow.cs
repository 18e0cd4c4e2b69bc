namespace OpsLvp.Data.Entities;

/// <summary>Row of <c>readings</c>: every reading received, accepted or not (docs/engine.md R1).</summary>
public sealed class ReadingRow
{
    public long Id { get; set; }

    /// <summary>The reading's own time; null when it could not be parsed.</summary>
    public DateTimeOffset? Time { get; set; }

    public DateTimeOffset ReceivedAt { get; set; }

    /// <summary>Feed or client it came from, e.g. "sim", "push:api-key-name".</summary>
    public required string Source { get; set; }

    public required string Sensor { get; set; }

    /// <summary><see cref="OpsLvp.Core.Readings.ReadingKind"/> name, or the raw text when it did not parse.</summary>
    public required string Kind { get; set; }

    public double? Value { get; set; }

    /// <summary><see cref="OpsLvp.Core.Readings.ReadingStatus"/> name, or the raw text.</summary>
    public string? Status { get; set; }

    public bool Accepted { get; set; }

    /// <summary><see cref="OpsLvp.Core.Readings.RejectReason"/> name; null when accepted.</summary>
    public string? RejectReason { get; set; }

    public string? RejectDetail { get; set; }
}
