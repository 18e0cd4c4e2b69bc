namespace OpsLvp.Web.Feeds;

/// <summary>Error body of the feed endpoints: one sentence saying what is wrong.</summary>
public sealed record ApiError(string Error);
