namespace OpsLvp.Web.Feeds;

/// <summary>A rejected item in a push response: its index in <c>readings</c>, a stable reason code and a detail.</summary>
public sealed record PushRejection(int Index, string Reason, string Detail, string? Sensor);
