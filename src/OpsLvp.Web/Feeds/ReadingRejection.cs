using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// An input item that did not become a <see cref="Reading"/>. <paramref name="Index"/> is the item's
/// 0-based position in its batch (JSON array index or CSV data row); <paramref name="SensorId"/> is
/// the sensor named by the item when it could be read.
/// </summary>
public sealed record ReadingRejection(int Index, RejectReason Reason, string Detail, string? SensorId = null);
