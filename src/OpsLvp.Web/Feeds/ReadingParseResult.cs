using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>The good readings of a document and a rejection for each item that was not.</summary>
public sealed record ReadingParseResult(IReadOnlyList<Reading> Readings, IReadOnlyList<ReadingRejection> Rejections)
{
    /// <summary>The 0-based item index of each reading, parallel to <see cref="Readings"/> (empty when the reader kept none).</summary>
    public IReadOnlyList<int> Indexes { get; init; } = [];

    public ReadingBatch ToBatch(string source, DateTimeOffset receivedAt) => new(source, receivedAt, Readings, Rejections);
}
