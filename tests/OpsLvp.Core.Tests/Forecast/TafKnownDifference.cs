using System.Text.Json.Nodes;
using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// A named, explained way in which metar-taf-parser decodes a TAF differently from us. <see cref="ModelNpm"/> edits our
/// projected decode (see <see cref="TafCrossCheckTests"/>) in place into what the package is known to produce.
/// </summary>
internal sealed record TafKnownDifference(string Name, string Why, Action<JsonObject, TafReport> ModelNpm);
