namespace OpsLvp.Web.Feeds;

/// <summary>A whole feed document could not be read (not JSON, wrong shape, too many items); no item of it is used.</summary>
public class FeedFormatException(string message, Exception? inner = null) : Exception(message, inner);
