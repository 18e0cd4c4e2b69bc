using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// What one feed delivered at once: <paramref name="Source"/> names the feed (<c>http:{name}</c>,
/// <c>push:{key name}</c>, <c>demo</c>), <paramref name="ReceivedAt"/> is app-clock time of arrival.
/// Rejections here are structural (<see cref="RejectReason.Malformed"/>); the engine host applies the rest.
/// A feed that must know whether the batch was durably recorded passes a <paramref name="Receipt"/>.
/// </summary>
public sealed record ReadingBatch(string Source, DateTimeOffset ReceivedAt, IReadOnlyList<Reading> Readings, IReadOnlyList<ReadingRejection> Rejections, BatchReceipt? Receipt = null)
{
    /// <summary>Forecasts that came with the batch (a TAF, the TREND of a METAR/SPECI; docs/engine.md R25), applied after its readings.</summary>
    public IReadOnlyList<OpsLvp.Core.Engine.ForecastInput> Forecasts { get; init; } = [];

    /// <summary>The <c>reading_inbox</c> row the batch came from (pushed to a standby; docs/engine.md R74), deleted when its readings are stored; null otherwise.</summary>
    public long? InboxId { get; init; }
}
