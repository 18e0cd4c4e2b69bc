namespace OpsLvp.Web.Feeds.Demo;

/// <summary>One row of a demo actions CSV with its offset from the scenario start.</summary>
public sealed record ScenarioAction(TimeSpan Offset, string Actor, string Action, string Target, string? Value, string Reason)
{
    public DemoAction At(DateTimeOffset time) => new(time, Actor, Action, Target, Value, Reason);
}
