namespace OpsLvp.Web.Feeds;

/// <summary>A feed document holds more items than the reader accepts at once (push ingest answers 413).</summary>
public sealed class FeedItemLimitException(string message) : FeedFormatException(message);
