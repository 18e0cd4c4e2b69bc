namespace OpsLvp.Web.Feeds;

/// <summary>Body of 202 from <c>POST /api/readings</c>: the batch source, how many items were queued and which were not.</summary>
public sealed record PushResponse(string Source, int Accepted, IReadOnlyList<PushRejection> Rejected);
