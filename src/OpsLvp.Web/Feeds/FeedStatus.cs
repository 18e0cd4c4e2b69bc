namespace OpsLvp.Web.Feeds;

/// <summary>Health of one feed; the rule is <see cref="FeedHealthRules.Evaluate"/> (docs/feeds.md).</summary>
public enum FeedStatus
{
    Ok,
    Degraded,
    Down,
}
