using Microsoft.AspNetCore.Http.HttpResults;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// The outcome of <see cref="IngestKeyCheck"/>: the key's name when the caller may ingest, else the 401 or 403
/// answer to send (<see cref="Refusal"/>, never both).
/// </summary>
public sealed record IngestCaller(string? KeyName, JsonHttpResult<ApiError>? Refusal);
