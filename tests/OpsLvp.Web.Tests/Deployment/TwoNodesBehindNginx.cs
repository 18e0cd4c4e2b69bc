using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Deployment;

/// <summary>
/// Two real app nodes (Kestrel on 127.0.0.1, each with its own SQLite file and the invented test profile) behind the
/// repository's nginx configuration, each trusting nginx (127.0.0.1) for forwarded headers. Nothing is started when
/// nginx is missing and not required (the tests are skipped then).
/// </summary>
public sealed class TwoNodesBehindNginx : IAsyncLifetime
{
    private readonly List<string> _folders = [];

    public IReadOnlyList<OpsLvpApp> Nodes { get; private set; } = [];

    public NginxProcess Nginx { get; private set; } = null!;

    public async Task InitializeAsync()
    {
        if (NginxProcess.SkipReason is not null)
        {
            return;
        }
        var nodes = new List<OpsLvpApp>();
        for (var i = 0; i < 2; i++)
        {
            var folder = OpsLvpApp.NewDataFolder();
            _folders.Add(folder);
            var settings = LiveTestProfile.Settings(LiveTestProfile.Write(folder));
            settings["Network:TrustedProxies:0"] = "127.0.0.1";
            settings["Cluster:NodeId"] = "test-node-" + (i + 1);
            nodes.Add(OpsLvpApp.Start(settings, folder));
        }
        Nodes = nodes;
        Nginx = await NginxProcess.StartAsync(nodes.Select(n => n.BaseAddress).ToList());
    }

    /// <summary>The node listening at <paramref name="upstream"/> (<c>127.0.0.1:port</c> as nginx logs it).</summary>
    public OpsLvpApp NodeAt(string upstream) =>
        Assert.Single(Nodes, n => $"{n.BaseAddress.Host}:{n.BaseAddress.Port}" == upstream);

    public async Task DisposeAsync()
    {
        Nginx?.Dispose();
        foreach (var node in Nodes)
        {
            await node.DisposeAsync();
        }
        foreach (var folder in _folders)
        {
            OpsLvpApp.TryDelete(folder);
        }
    }
}
