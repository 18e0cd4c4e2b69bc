namespace OpsLvp.Web.Live;

/// <summary>
/// Whether the server is recording (readings and audit durably stored). While <paramref name="Recording"/> is false,
/// readings are refused, actions are not applied, and every screen shows "NOT RECORDING since" <paramref name="Since"/>
/// (app clock) and greys the values it cannot vouch for (docs/reliability.md "Storage faults").
/// A node that does not lead and has not heard from the leader says <paramref name="Headline"/> ("NOT LIVE") instead,
/// <paramref name="Since"/> being the instant of the last state it received (docs/deployment.md "Fan-out").
/// </summary>
public sealed record RecordingView(bool Recording, DateTimeOffset? Since, string? Reason, string? Headline = null)
{
    public static readonly RecordingView Ok = new(true, null, null);
}
