namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// A small invented aerodrome profile for end-to-end runs: one LVP runway with three direct-RVR sensors, a
/// ceilometer, two teams and short dwells (escalation at once, recovery after 60 s). Values are invented and
/// illustrative, not any aerodrome's approved values.
/// </summary>
public static class TestProfile
{
    public const string Tdz = "rvr-09-tdz";
    public const string Mid = "rvr-09-mid";
    public const string End = "rvr-09-end";
    public const string Ceilometer = "ceilo-test";
    public const string ApronTeam = "apron";
    public const string LightsTeam = "lights";

    /// <summary>The default test profile: no confirmation, recovery dwells of 60 s, one cancellation item.</summary>
    public static string Json { get; } = Variant();

    /// <summary>
    /// The test profile with preparation→active needing the duty manager's confirmation (<paramref name="confirmActive"/>),
    /// other recovery dwells (<paramref name="recoverDwellSeconds"/>) and, when <paramref name="cancellationItem"/> is
    /// false, no cancellation checklist (so an episode can run back to normal by readings alone); with
    /// <paramref name="inForceNeedsSafeguards"/> LVP are in force only once the mandatory preparation items are done
    /// (docs/engine.md R13, the profile default).
    /// </summary>
    public static string Variant(bool confirmActive = false, int recoverDwellSeconds = 60, bool cancellationItem = true, bool inForceNeedsSafeguards = false) =>
        Template
            .Replace("\"inForceNeedsSafeguards\": false", $"\"inForceNeedsSafeguards\": {(inForceNeedsSafeguards ? "true" : "false")}", StringComparison.Ordinal)
            .Replace("\"confirm\": []", confirmActive ? "\"confirm\": [ { \"from\": \"preparation\", \"to\": \"active\" }, { \"from\": \"normal\", \"to\": \"active\" } ]" : "\"confirm\": []", StringComparison.Ordinal)
            .Replace("\"recoverDwellSeconds\": 60", $"\"recoverDwellSeconds\": {recoverDwellSeconds}", StringComparison.Ordinal)
            .Replace(CancellationItem, cancellationItem ? CancellationItem : "", StringComparison.Ordinal);

    /// <summary>
    /// <paramref name="profileJson"/> (the template or a <see cref="Variant"/>) with an invented, illustrative capability
    /// section for runway direction 09: an ILS (the apron desk's) and approach lights (the lighting crew's); CAT I needs
    /// both and TDZ 550 m, CAT II needs both, TDZ 300 m and LVP in force. 550 m and 300 m are the usual CAT I and CAT II
    /// RVR bands (from memory, docs/sources.md "Approach categories"); any aerodrome's own values are local.
    /// </summary>
    public static string WithCapability(string profileJson)
    {
        ArgumentNullException.ThrowIfNull(profileJson);
        var result = profileJson.Replace("\"checklists\": {", CapabilitySection.Trim(), StringComparison.Ordinal);
        if (result == profileJson)
        {
            throw new ArgumentException("the profile has no \"checklists\" section to put the capability before", nameof(profileJson));
        }
        return result;
    }

    private const string CapabilitySection = """
          "capability": {
            "observerRvrMaxAgeSeconds": 900,
            "facilities": [
              { "id": "ils-09", "name": "ILS 09", "kind": "ils", "ilsCategory": "catII", "directions": ["09"], "team": "apron" },
              { "id": "als-09", "name": "Approach lights 09", "kind": "approachLighting", "directions": ["09"], "team": "lights" }
            ],
            "operations": [
              { "direction": "09", "kind": "catI", "facilities": ["ils-09", "als-09"], "rvr": [ { "position": "tdz", "minimumM": 550 } ], "needsLvp": false },
              { "direction": "09", "kind": "catII", "facilities": ["ils-09", "als-09"], "rvr": [ { "position": "tdz", "minimumM": 300 } ], "needsLvp": true }
            ]
          },
          "checklists": {
        """;

    private const string CancellationItem = """{ "id": "can-release", "text": "Release the ILS areas (invented)", "team": "apron", "mandatory": true, "dueWithinMinutes": 10 }""";

    private const string Template = """
        {
          "version": "e2e-1 (invented)",
          "aerodrome": { "id": "XTST", "name": "Test Field (invented)", "timeZone": "Europe/Lisbon", "illustrative": true },
          "runways": [ { "id": "09/27", "directions": ["09", "27"], "lvp": true, "directionInUse": "09" } ],
          "sensors": [
            { "id": "rvr-09-tdz", "type": "rvrSystem", "runway": "09/27", "sites": { "09": "tdz", "27": "end" } },
            { "id": "rvr-09-mid", "type": "rvrSystem", "runway": "09/27", "sites": { "09": "mid", "27": "mid" } },
            { "id": "rvr-09-end", "type": "rvrSystem", "runway": "09/27", "sites": { "09": "end", "27": "tdz" } },
            { "id": "ceilo-test", "type": "ceilometer" }
          ],
          "teams": [ { "id": "apron", "name": "Apron desk (invented)" }, { "id": "lights", "name": "Lighting crew (invented)" } ],
          "maxAgeSeconds": { "rvr": 120, "cloudBase": 180, "verticalVisibility": 180, "visibility": 180 },
          "governingPositions": ["tdz", "mid", "end"],
          "thresholds": {
            "preparation": { "rvrBelowM": 1000, "rvrRecoverM": 1200, "ceilingBelowFt": 300, "ceilingRecoverFt": 400, "enterDwellSeconds": 0, "recoverDwellSeconds": 60 },
            "active": { "rvrBelowM": 550, "rvrRecoverM": 650, "ceilingBelowFt": 200, "ceilingRecoverFt": 250, "enterDwellSeconds": 0, "recoverDwellSeconds": 60 }
          },
          "confirm": [],
          // browser flows push RVR straight to active; the safeguards rule (docs/engine.md R13) is tested in Core and Web.Tests
          "inForceNeedsSafeguards": false,
          "checklists": {
            "preparation": [
              { "id": "prep-works", "text": "Stop airside works (invented)", "team": "apron", "mandatory": true, "dueWithinMinutes": 20 },
              { "id": "prep-lights", "text": "Check stop bars (invented)", "team": "lights", "mandatory": true, "dueWithinMinutes": 15 }
            ],
            "active": [
              { "id": "act-areas", "text": "Keep ILS critical areas clear (invented)", "team": "apron", "mandatory": true, "dueWithinMinutes": 10 }
            ],
            "cancellation": [
              { "id": "can-release", "text": "Release the ILS areas (invented)", "team": "apron", "mandatory": true, "dueWithinMinutes": 10 }
            ]
          }
        }
        """;
}
