namespace OpsLvp.Web.Feeds;

/// <summary>
/// Body of <c>GET /health</c>. <c>status</c> is "ok" whenever the server answers and records, "failing" while it is
/// not recording (storage failing), or while a standby cannot show live state (<c>statusReason</c> says which);
/// <c>node</c> says which node answers (docs/deployment.md "Which node am I: /health");
/// <c>feedsStatus</c> is the worst feed status ("ok" when there are no feeds); <c>engine</c> is the engine host's
/// last evaluation and whether audit storage works.
/// </summary>
public sealed record HealthResponse(string Status, DateTimeOffset Time, bool Demo, double? DemoSpeed, string FeedsStatus, IReadOnlyList<FeedHealthDto> Feeds, OpsLvp.Web.Engine.EngineHealth? Engine = null, NodeHealth? Node = null, string? StatusReason = null);
