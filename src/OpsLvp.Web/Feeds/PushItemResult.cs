namespace OpsLvp.Web.Feeds;

/// <summary>
/// What became of one item of a push request, in request order: <paramref name="Outcome"/> is <c>accepted</c> or
/// <c>rejected</c>; a rejection has a stable <paramref name="Reason"/> code and a <paramref name="Detail"/>.
/// </summary>
public sealed record PushItemResult(int Index, string? Sensor, string Outcome, string? Reason = null, string? Detail = null)
{
    public const string Accepted = "accepted";

    public const string Rejected = "rejected";
}
