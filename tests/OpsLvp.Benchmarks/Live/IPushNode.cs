namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// One server of the push-ha harness: the real app (<see cref="BenchServer"/>) or the bare hub (<see cref="BareServer"/>),
/// in this process (<see cref="LocalNode"/>) or in a process of its own (<see cref="NodeProcess"/>). The harness posts
/// readings to <see cref="BaseAddress"/> and its clients connect there; everything else it asks goes through here.
/// </summary>
internal interface IPushNode : IAsyncDisposable
{
    /// <summary>http://127.0.0.1:{port}/ of the node's Kestrel.</summary>
    Uri BaseAddress { get; }

    /// <summary>The node's cluster id, whether it leads, and whether its engine has restored (a state to evaluate on).</summary>
    /// <exception cref="InvalidOperationException">The bare hub: no leadership, no engine.</exception>
    Task<NodeStatus> StatusAsync();

    /// <summary>Issues one API key with the ingest and hub-read scopes (<see cref="BenchServer.IssuePushKeyAsync"/>); returns its secret.</summary>
    /// <exception cref="InvalidOperationException">The bare hub: no keys.</exception>
    Task<string> IssuePushKeyAsync();

    /// <summary>The bare hub: the size in characters of the string <c>POST /bare</c> broadcasts from now on.</summary>
    /// <exception cref="InvalidOperationException">Not the bare hub.</exception>
    Task SetBarePayloadAsync(int chars);
}

/// <summary>What <see cref="IPushNode.StatusAsync"/> answers.</summary>
internal sealed record NodeStatus(string NodeId, bool IsLeader, bool EngineRestored);

/// <summary>A node to start: <paramref name="Name"/> for messages and the prefix of its standard error; the app's settings (<see cref="BenchServer.Start"/>), or null for the bare hub.</summary>
internal sealed record NodeSpec(string Name, Dictionary<string, string?>? Settings);
