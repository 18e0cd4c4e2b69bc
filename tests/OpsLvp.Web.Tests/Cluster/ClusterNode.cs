using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>One real app on Kestrel with its own SQLite folder, on a shared Redis, with a <see cref="SwitchableLeadership"/>.</summary>
public sealed class ClusterNode : IAsyncDisposable
{
    private ClusterNode(OpsLvpApp app, SwitchableLeadership leadership)
    {
        App = app;
        Leadership = leadership;
    }

    public OpsLvpApp App { get; }

    public SwitchableLeadership Leadership { get; }

    /// <summary>Starts node <paramref name="name"/> on <paramref name="redis"/> (a configuration string), leading or not, with the live test profile (invented).</summary>
    public static ClusterNode Start(string name, string redis, bool leader, long epoch = 1, IDictionary<string, string?>? settings = null)
    {
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
            var app = OpsLvpApp.Start(all, folder, s => s.Replace(ServiceDescriptor.Singleton<ILeadership>(leadership)));
            return new ClusterNode(app, leadership);
        }
        catch
        {
            OpsLvpApp.TryDelete(folder);
            throw;
        }
    }

    public async ValueTask DisposeAsync()
    {
        await App.DisposeAsync();
        OpsLvpApp.TryDelete(App.DataFolder);
    }
}
