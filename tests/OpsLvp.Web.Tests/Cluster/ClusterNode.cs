using System.Collections.Concurrent;
using Microsoft.AspNetCore.DataProtection;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// One real app on Kestrel with its own SQLite folder, on a shared Redis, with a <see cref="SwitchableLeadership"/>.
/// The nodes of one Redis share one data-protection key ring (a folder standing in for the database every node of a
/// real installation shares), so they can seal messages to each other; a node given <c>ownKeyRing</c> keeps its own, as
/// a node of another installation would.
/// </summary>
public sealed class ClusterNode : IAsyncDisposable
{
    private static readonly ConcurrentDictionary<string, string> s_keyRings = new(StringComparer.Ordinal);

    private ClusterNode(OpsLvpApp app, SwitchableLeadership leadership)
    {
        App = app;
        Leadership = leadership;
    }

    public OpsLvpApp App { get; }

    public SwitchableLeadership Leadership { get; }

    /// <summary>
    /// Starts node <paramref name="name"/> on <paramref name="redis"/> (a configuration string), leading or not, with the
    /// live test profile (invented); <paramref name="services"/> may add to its services (e.g. a clock set wrong).
    /// </summary>
    public static ClusterNode Start(string name, string redis, bool leader, long epoch = 1, IDictionary<string, string?>? settings = null, bool ownKeyRing = false, Action<IServiceCollection>? services = null)
    {
        var keyRing = ownKeyRing ? null : KeyRingFolder(redis);
        var folder = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(folder);
        var all = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
        all["Cluster:NodeId"] = name;
        all["Cluster:Redis"] = redis;
        all["Cluster:LeaderSilence"] = "00:00:02";
        foreach (var (key, value) in settings ?? new Dictionary<string, string?>())
        {
            all[key] = value;
        }
        var leadership = new SwitchableLeadership(name, leader, epoch);
        try
        {
            var app = OpsLvpApp.Start(all, folder, s =>
            {
                s.Replace(ServiceDescriptor.Singleton<ILeadership>(leadership));
                if (keyRing is not null)
                {
                    s.AddDataProtection().PersistKeysToFileSystem(new DirectoryInfo(keyRing));
                }
                services?.Invoke(s);
            });
            return new ClusterNode(app, leadership);
        }
        catch
        {
            OpsLvpApp.TryDelete(folder);
            throw;
        }
    }

    /// <summary>The key ring folder shared by the nodes of <paramref name="redis"/>, with its key created once, before any node starts.</summary>
    public static string KeyRingFolder(string redis) => s_keyRings.GetOrAdd(redis, static r =>
    {
        var folder = Path.Combine(Path.GetTempPath(), "opslvp-test-keyring-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        _ = DataProtectionProvider.Create(new DirectoryInfo(folder), b => b.SetApplicationName("OpsLvp")).CreateProtector("warm-up").Protect("key");
        return folder;
    });

    public async ValueTask DisposeAsync()
    {
        await App.DisposeAsync();
        OpsLvpApp.TryDelete(App.DataFolder);
    }
}
