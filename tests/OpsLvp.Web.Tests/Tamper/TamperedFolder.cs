using System.Text.Json;
using Microsoft.Data.Sqlite;
using OpsLvp.Cli;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Tamper;

/// <summary>
/// A data folder a real server recorded into and stopped, with its anchor key and log beside it (the default
/// layout, docs/audit.md "Anchors"), ready to be tampered with. The recording is invented: RVR 900 m moves the
/// live test profile to preparation, RVR 400 m to LVP in force; each transition covers the readings before it.
/// </summary>
public sealed class TamperedFolder : IAsyncDisposable
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

    /// <summary>Runs SQL on the stopped server's file, as someone with write access to it would; returns the first column of the last statement's first row.</summary>
    public async Task<object?> SqlAsync(string sql)
    {
        await using var connection = new SqliteConnection($"Data Source={Database};Pooling=False");
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return await command.ExecuteScalarAsync();
    }

    /// <summary><c>opslvp audit verify --db … --anchors … --public-key …</c> (the anchors and key optional).</summary>
    public (int Code, JsonElement Output, string Stderr) Verify(bool anchors = true, bool publicKey = true)
    {
        var args = new List<string> { "audit", "verify", "--db", Database };
        if (anchors)
        {
            args.AddRange(["--anchors", AnchorLog]);
            if (publicKey)
            {
                args.AddRange(["--public-key", PublicKeyPath]);
            }
        }
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run([.. args], stdout, stderr);
        var text = stdout.ToString();
        return (code, text.Length == 0 ? default : JsonDocument.Parse(text).RootElement.Clone(), stderr.ToString());
    }

    public async ValueTask DisposeAsync()
    {
        SqliteConnection.ClearAllPools();
        await Task.Yield();
        OpsLvpApp.TryDelete(Folder);
    }
}
