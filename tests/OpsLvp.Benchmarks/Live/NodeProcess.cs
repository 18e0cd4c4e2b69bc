using System.Globalization;
using System.Text.Json;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// <see cref="IPushNode"/> in a process of its own, as a deployment runs each node: this program started again with
/// <see cref="RoleArguments"/>, which starts one <see cref="LocalNode"/> there (<see cref="RunChildAsync"/>). Each node
/// then has its own garbage collector, thread pool and Npgsql pool (all still share the machine's cores).
/// </summary>
/// <remarks>
/// Protocol (<see cref="ChildProcess"/>): <c>start JSON</c> (the <see cref="NodeSpec"/>) → <c>started ADDRESS</c>;
/// <c>status</c> → <c>status NODEID True|False True|False</c> (leads, engine restored); <c>key</c> → <c>key SECRET</c>;
/// <c>payload CHARS</c> → <c>payload</c>; <c>quit</c> or end of input → the child stops its node and ends.
/// </remarks>
internal sealed class NodeProcess : IPushNode
{
    /// <summary>The arguments that make this program a node process instead of a benchmark run.</summary>
    public static readonly string[] RoleArguments = ["--role", "node"];

    /// <summary>How long starting a node may take (migrations, on a loaded machine: generous).</summary>
    private static readonly TimeSpan StartLimit = TimeSpan.FromMinutes(5);

    /// <summary>How long the child waits for its node to stop before it ends anyway.</summary>
    private static readonly TimeSpan StopLimit = TimeSpan.FromSeconds(30);

    private readonly ChildProcess _child;

    private NodeProcess(ChildProcess child, Uri baseAddress)
    {
        _child = child;
        BaseAddress = baseAddress;
    }

    public Uri BaseAddress { get; }

    /// <summary>Starts the node process and its node; returns once the node listens.</summary>
    /// <exception cref="InvalidOperationException">The process or its node did not start.</exception>
    public static async Task<IPushNode> StartAsync(NodeSpec spec)
    {
        var child = ChildProcess.Start(RoleArguments, $"the node process {spec.Name}", spec.Name);
        try
        {
            var answer = await child.AskAsync("start\t" + JsonSerializer.Serialize(spec), "started", StartLimit);
            return new NodeProcess(child, new Uri(answer[1]));
        }
        catch
        {
            await child.DisposeAsync();
            throw;
        }
    }

    public async Task<NodeStatus> StatusAsync()
    {
        var answer = await _child.AskAsync("status", "status", ChildProcess.AnswerLimit);
        return new NodeStatus(answer[1], bool.Parse(answer[2]), bool.Parse(answer[3]));
    }

    public async Task<string> IssuePushKeyAsync() => (await _child.AskAsync("key", "key", ChildProcess.AnswerLimit))[1];

    public async Task SetBarePayloadAsync(int chars) =>
        await _child.AskAsync(string.Create(CultureInfo.InvariantCulture, $"payload\t{chars}"), "payload", ChildProcess.AnswerLimit);

    public ValueTask DisposeAsync() => _child.DisposeAsync();

    /// <summary>
    /// The node process's main loop (this program started with <see cref="RoleArguments"/>): serves the requests of the
    /// remarks above until <c>quit</c> or the end of standard input, then stops its node (waiting at most
    /// <see cref="StopLimit"/>). Returns the exit code (0).
    /// </summary>
    public static async Task<int> RunChildAsync()
    {
        IPushNode? node = null;
        try
        {
            return await ChildProcess.ServeAsync(async request =>
            {
                switch (request[0])
                {
                    case "start":
                        if (node is not null)
                        {
                            throw new InvalidOperationException("started already: one node per process");
                        }
                        node = await LocalNode.StartAsync(JsonSerializer.Deserialize<NodeSpec>(request[1]) ?? throw new FormatException("start: no node"));
                        return "started\t" + node.BaseAddress;
                    case "status":
                        var status = await Started().StatusAsync();
                        return string.Create(CultureInfo.InvariantCulture, $"status\t{status.NodeId}\t{status.IsLeader}\t{status.EngineRestored}");
                    case "key":
                        return "key\t" + await Started().IssuePushKeyAsync();
                    case "payload":
                        await Started().SetBarePayloadAsync(int.Parse(request[1], CultureInfo.InvariantCulture));
                        return "payload";
                    default:
                        throw new FormatException($"unknown request '{request[0]}'");
                }
            });
        }
        finally
        {
            if (node is not null)
            {
                try
                {
                    await node.DisposeAsync().AsTask().WaitAsync(StopLimit);
                }
                catch (TimeoutException)
                {
                    await Console.Error.WriteLineAsync($"the node did not stop within {StopLimit.TotalSeconds:0} s; ending anyway");
                }
            }
        }

        IPushNode Started() => node ?? throw new InvalidOperationException("no node: 'start' first");
    }
}
