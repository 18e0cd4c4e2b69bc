using System.Text.Json;
using Microsoft.Data.Sqlite;
using OpsLvp.FaultCases;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Tamper;

/// <summary>
/// A data folder a real server recorded into and stopped, with its anchor key and log beside it (the default
/// layout, docs/audit.md "Anchors"), ready to be tampered with. The recording is invented: RVR 900 m moves the
/// live test profile to preparation, RVR 400 m to LVP in force; each transition covers the readings before it.
/// </summary>
public sealed class TamperedFolder : ITamperTarget, IAsyncDisposable
{
    private TamperedFolder(string folder, string profile)
    {
        Folder = folder;
        Profile = profile;
    }

    public string Folder { get; }

    public string Profile { get; }

    public string Database => Path.Combine(Folder, EngineServiceCollectionExtensions.DatabaseFileName);

    public string AnchorsFolder => Folder + "-anchors";

    public string AnchorLog => Path.Combine(AnchorsFolder, "anchors.jsonl");

    public string KeyPath => Path.Combine(AnchorsFolder, "anchor-key.pem");

    public string PublicKeyPath => Path.Combine(AnchorsFolder, "anchor-key.pub.pem");

    public string TdzSensor => LiveTestProfile.Tdz;

    /// <summary>Starts a server on a fresh folder, records the invented night and stops it (the stop writes the last anchor).</summary>
    public static async Task<TamperedFolder> RecordAsync()
    {
        var folder = OpsLvpApp.NewDataFolder();
        var recorded = new TamperedFolder(folder, LiveTestProfile.Write(folder));
        await using (var app = recorded.Start())
        {
            var now = DateTimeOffset.UtcNow;
            await LiveClient.PushAsync(app, LiveClient.Item(now.AddSeconds(-3), LiveTestProfile.Tdz, "rvr", 1500));
            await LiveClient.PushAsync(app, LiveClient.Item(now.AddSeconds(-2), LiveTestProfile.Tdz, "rvr", 900));
            await LiveClient.WaitForPhaseAsync(app, "preparation", TimeSpan.FromSeconds(45));
            await LiveClient.PushAsync(app, LiveClient.Item(now.AddSeconds(-1), LiveTestProfile.Tdz, "rvr", 400));
            await LiveClient.WaitForPhaseAsync(app, "active", TimeSpan.FromSeconds(45));
        }
        SqliteConnection.ClearAllPools();
        return recorded;
    }

    public OpsLvpApp Start(IDictionary<string, string?>? extra = null)
    {
        var settings = LiveTestProfile.Settings(Profile);
        foreach (var (k, v) in extra ?? new Dictionary<string, string?>())
        {
            settings[k] = v;
        }
        return OpsLvpApp.Start(settings, Folder);
    }

    public async Task StartAndStopAsync()
    {
        await using var again = Start();
    }

    public Task<object?> SqlAsync(string sql) => TamperFiles.SqlAsync(Database, sql);

    /// <summary><c>opslvp audit verify --db … --anchors … --public-key …</c> (the anchors and key optional).</summary>
    public (int Code, JsonElement Output, string Stderr) Verify(bool anchors = true, bool publicKey = true) =>
        TamperFiles.Verify(Database, anchors ? AnchorLog : null, publicKey ? PublicKeyPath : null);

    public async ValueTask DisposeAsync()
    {
        SqliteConnection.ClearAllPools();
        await Task.Yield();
        OpsLvpApp.TryDelete(Folder);
    }
}
