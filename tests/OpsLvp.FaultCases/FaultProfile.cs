namespace OpsLvp.FaultCases;

/// <summary>
/// The invented aerodrome profile the fault suite runs against ("Fault Field (invented)", XFLT): one LVP runway with an
/// RVR system at TDZ and a forward-scatter meter at MID, no dwells, so pushed readings move the phase. All values
/// invented.
/// </summary>
public static class FaultProfile
{
    public const string PushKey = "fault-suite-key-0123456789abcdef";

    /// <summary>An RVR system: sends <c>rvr</c> and <c>visibility</c>.</summary>
    public const string Tdz = "f-tdz";

    /// <summary>A forward-scatter meter: sends <c>extinction</c>, <c>rvr</c> and <c>visibility</c>.</summary>
    public const string Mid = "f-fs";

    /// <summary>Seconds a reading may be dated after the server's clock (the profile's <c>futureSkewSeconds</c>, default).</summary>
    public const int FutureSkewSeconds = 5;

    /// <summary>Writes the profile as <c>fault-profile.json</c> in <paramref name="folder"/>; returns its path.</summary>
    public static string Write(string folder)
    {
        Directory.CreateDirectory(folder);
        var path = Path.Combine(folder, "fault-profile.json");
        File.WriteAllText(path, """
            {
              "version": "fault-suite-1",
              "aerodrome": { "id": "XFLT", "name": "Fault Field (invented)", "timeZone": "UTC", "illustrative": true },
              "runways": [ { "id": "09/27", "directions": ["09", "27"], "lvp": true } ],
              "sensors": [
                { "id": "f-tdz", "type": "rvrSystem", "runway": "09/27", "sites": { "09": "tdz", "27": "end" } },
                { "id": "f-fs", "type": "forwardScatter", "runway": "09/27", "sites": { "09": "mid", "27": "mid" } }
              ],
              "teams": [ { "id": "f-ops", "name": "Fault operations" } ],
              "lights": { "intensityCdByStep": { "5": 10000 }, "stepInUse": 5 },
              "maxAgeSeconds": { "rvr": 600, "extinction": 600, "visibility": 600 },
              "thresholds": {
                "preparation": { "rvrBelowM": 1000, "rvrRecoverM": 1200, "enterDwellSeconds": 0, "recoverDwellSeconds": 1 },
                "active": { "rvrBelowM": 550, "rvrRecoverM": 650, "enterDwellSeconds": 0, "recoverDwellSeconds": 1 }
              },
              "confirm": [],
              "inForceNeedsSafeguards": false,
              "checklists": {
                "preparation": [ { "id": "fp-1", "text": "Fault preparation item", "team": "f-ops", "mandatory": true, "dueWithinMinutes": 10 } ],
                "active": [ { "id": "fa-1", "text": "Fault active item", "team": "f-ops", "mandatory": true, "dueWithinMinutes": 10 } ],
                "cancellation": [ { "id": "fc-1", "text": "Fault cancellation item", "team": "f-ops", "mandatory": true, "dueWithinMinutes": 10 } ]
              }
            }
            """);
        return path;
    }
}
