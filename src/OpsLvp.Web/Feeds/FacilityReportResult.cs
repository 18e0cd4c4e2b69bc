namespace OpsLvp.Web.Feeds;

/// <summary>
/// What became of one entry of <c>POST /api/facilities</c>, in request order: <paramref name="Outcome"/> is
/// <c>accepted</c> (applied and audited) or <c>rejected</c> with a stable <paramref name="Reason"/> code and a
/// <paramref name="Detail"/> a person can read (docs/capability.md "Facility ingest").
/// </summary>
public sealed record FacilityReportResult(int Index, string? Facility, string Outcome, string? Reason = null, string? Detail = null)
{
    public const string Accepted = "accepted";

    public const string Rejected = "rejected";
}
