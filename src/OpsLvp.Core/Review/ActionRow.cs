namespace OpsLvp.Core.Review;

/// <summary>One line of an actions file (docs/replay.md: <c>time,actor,action,target,value,reason</c>).</summary>
public sealed record ActionRow(DateTimeOffset Time, string Actor, string Action, string Target, string Value, string Reason);
