using System.Text.Json.Nodes;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// A named, explained way in which the npm package metar-taf-parser decodes a report differently from us.
/// <see cref="ModelNpm"/> takes our value of <see cref="Field"/> (full form, with our extra fields), our whole JSON
/// and the report text, and returns what the package is known to produce instead.
/// </summary>
internal sealed record KnownDifference(
    string Name,
    string Field,
    string Why,
    Func<JsonNode?, JsonObject, string, JsonNode?> ModelNpm);
