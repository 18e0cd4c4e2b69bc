namespace OpsLvp.Web.Feeds;

/// <summary>Body of 200 from <c>POST /api/facilities</c>: who reported, how many entries were applied and were not, one result per entry.</summary>
public sealed record FacilityReportResponse(string Source, int Accepted, int Rejected, IReadOnlyList<FacilityReportResult> Items);
