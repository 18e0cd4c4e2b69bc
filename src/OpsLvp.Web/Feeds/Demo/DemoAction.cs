namespace OpsLvp.Web.Feeds.Demo;

/// <summary>
/// A scripted demo action (<c>time,actor,action,target,value,reason</c>), stamped with the demo time it plays at.
/// The fields are passed on as written; the engine host interprets and executes them.
/// </summary>
public sealed record DemoAction(DateTimeOffset Time, string Actor, string Action, string Target, string? Value, string Reason);
