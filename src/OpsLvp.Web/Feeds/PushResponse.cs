namespace OpsLvp.Web.Feeds;

/// <summary>
/// Body of 202 from <c>POST /api/readings</c>: the batch source, how many items passed, the ones that did not, and
/// <paramref name="Items"/>, one result per item in request order. Rejections include the engine's screening
/// (docs/engine.md R1: unknown sensor, kind not produced, status, range, future time); duplicate and older-than-latest
/// are decided when the engine takes the reading.
/// </summary>
public sealed record PushResponse(string Source, int Accepted, IReadOnlyList<PushRejection> Rejected, IReadOnlyList<PushItemResult> Items);
