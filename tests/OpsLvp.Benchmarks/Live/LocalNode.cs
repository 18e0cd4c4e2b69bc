using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;

namespace OpsLvp.Benchmarks.Live;

/// <summary><see cref="IPushNode"/> in this process: push-ha with <c>--nodes-in-process</c>, and the node of a <see cref="NodeProcess"/> child.</summary>
internal sealed class LocalNode : IPushNode
{
    private readonly BenchServer? _server;
    private readonly BareServer? _bare;

    private LocalNode(BenchServer? server, BareServer? bare, Uri baseAddress)
    {
        _server = server;
        _bare = bare;
        BaseAddress = baseAddress;
    }

    public Uri BaseAddress { get; }

    /// <summary>Starts the app with <see cref="NodeSpec.Settings"/>, or the bare hub when they are null.</summary>
    public static async Task<IPushNode> StartAsync(NodeSpec spec)
    {
        if (spec.Settings is null)
        {
            var bare = await BareServer.StartAsync();
            return new LocalNode(null, bare, bare.BaseAddress);
        }
        var server = BenchServer.Start(spec.Settings);
        return new LocalNode(server, null, server.BaseAddress);
    }

    public Task<NodeStatus> StatusAsync()
    {
        var services = App().Services;
        var leadership = services.GetRequiredService<ILeadership>();
        return Task.FromResult(new NodeStatus(leadership.NodeId, leadership.IsLeader, services.GetRequiredService<LiveEngineHost>().State is not null));
    }

    public Task<string> IssuePushKeyAsync() => App().IssuePushKeyAsync();

    public Task SetBarePayloadAsync(int chars)
    {
        if (_bare is null)
        {
            throw new InvalidOperationException("not the bare hub: its payload size cannot be set");
        }
        BareServer.PayloadChars = chars;
        return Task.CompletedTask;
    }

    public async ValueTask DisposeAsync()
    {
        if (_server is not null)
        {
            await _server.DisposeAsync();
        }
        if (_bare is not null)
        {
            await _bare.DisposeAsync();
        }
    }

    private BenchServer App() => _server ?? throw new InvalidOperationException("the bare hub has no leadership, engine or keys");
}
