using System.Globalization;

namespace OpsLvp.Web.Tests.Live;

/// <summary>
/// A small invented profile for live tests ("Test Field (invented)", XTST): one LVP runway with an RVR system at
/// TDZ and a forward-scatter meter at MID, short dwells so transitions happen within seconds. All values invented.
/// </summary>
public static class LiveTestProfile
{
    public const string PushKey = "live-test-key-0123456789";

    public const string Tdz = "t-tdz";

    public const string Mid = "t-fs";

    public const string Team = "t-ops";

    public const string OtherTeam = "t-fire";

    public static string Write(string folder, int activeEnterDwellSeconds = 0, int recoverDwellSeconds = 1)
    {
        Directory.CreateDirectory(folder);
        var path = Path.Combine(folder, "test-profile.json");
        var json = """
            {
              "version": "live-test-1",
              "aerodrome": { "id": "XTST", "name": "Test Field (invented)", "timeZone": "UTC", "illustrative": true },
              "runways": [ { "id": "09/27", "directions": ["09", "27"], "lvp": true } ],
              "sensors": [
                { "id": "t-tdz", "type": "rvrSystem", "runway": "09/27", "sites": { "09": "tdz", "27": "end" } },
                { "id": "t-fs", "type": "forwardScatter", "runway": "09/27", "sites": { "09": "mid", "27": "mid" } }
              ],
              "teams": [ { "id": "t-ops", "name": "Test operations" }, { "id": "t-fire", "name": "Test fire watch" } ],
              "lights": { "intensityCdByStep": { "5": 10000 }, "stepInUse": 5 },
              "maxAgeSeconds": { "rvr": 600, "extinction": 600, "visibility": 600 },
              "thresholds": {
                "preparation": { "rvrBelowM": 1000, "rvrRecoverM": 1200, "enterDwellSeconds": 0, "recoverDwellSeconds": RECOVER },
                "active": { "rvrBelowM": 550, "rvrRecoverM": 650, "enterDwellSeconds": ACTIVE, "recoverDwellSeconds": RECOVER }
              },
              "checklists": {
                "preparation": [ { "id": "tp-1", "text": "Test preparation item", "team": "t-ops", "mandatory": true, "dueWithinMinutes": 10 } ],
                "active": [ { "id": "ta-1", "text": "Test active item", "team": "t-fire", "mandatory": true, "dueWithinMinutes": 10 } ],
                "cancellation": [ { "id": "tc-1", "text": "Test cancellation item", "team": "t-ops", "mandatory": true, "dueWithinMinutes": 10 } ]
              }
            }
            """
            .Replace("ACTIVE", activeEnterDwellSeconds.ToString(CultureInfo.InvariantCulture), StringComparison.Ordinal)
            .Replace("RECOVER", recoverDwellSeconds.ToString(CultureInfo.InvariantCulture), StringComparison.Ordinal);
        File.WriteAllText(path, json);
        return path;
    }

    /// <summary>App settings: the test profile, a push key, the simulator off.</summary>
    public static Dictionary<string, string?> Settings(string profilePath) => new()
    {
        ["Engine:ProfilePath"] = profilePath,
        ["Engine:TickInterval"] = "00:00:00.200",
        ["Feeds:Push:ApiKeys:0:Name"] = "live-test",
        ["Feeds:Push:ApiKeys:0:Key"] = PushKey,
    };
}
