using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>The good readings of a document and a rejection for each item that was not.</summary>
public sealed record ReadingParseResult(IReadOnlyList<Reading> Readings, IReadOnlyList<ReadingRejection> Rejections)
{
    public ReadingBatch ToBatch(string source, DateTimeOffset receivedAt) => new(source, receivedAt, Readings, Rejections);
}
