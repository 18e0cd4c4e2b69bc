namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// The hub clients of <see cref="PushLatencyHarness.MeasureInterleavedAsync"/>, by setup (index in the list given to
/// <see cref="ConnectAsync"/>): in this process (<see cref="LocalProbes"/>) or in another (<see cref="ProbeProcess"/>).
/// Receipt times are <see cref="System.Diagnostics.Stopwatch.GetTimestamp"/> values of the process the clients run in.
/// </summary>
internal interface IProbes : IAsyncDisposable
{
    /// <summary>Connects every client of every setup (at most 50 connecting at once); returns when all are connected.</summary>
    Task ConnectAsync(IReadOnlyList<ProbeSetup> setups);

    /// <summary>
    /// Makes the clients of <paramref name="setup"/> wait for the next <c>state</c> containing <paramref name="marker"/>
    /// (null: any). Returns how many <c>state</c> messages of the previously awaited version its clients received since
    /// they were last armed (0 the first time).
    /// </summary>
    Task<long> ArmAsync(int setup, string? marker);

    /// <summary>Waits until every client of <paramref name="setup"/> has its awaited <c>state</c>; returns each one's receipt timestamp, in placement order.</summary>
    /// <exception cref="TimeoutException">Not all within <paramref name="timeout"/>; the message says how many had it.</exception>
    Task<long[]> WaitAsync(int setup, TimeSpan timeout);

    /// <summary>The <c>state</c> messages of the awaited version received since the last arm, and the largest payload (characters) any client of <paramref name="setup"/> saw.</summary>
    Task<(long Deliveries, int PayloadChars)> CountAsync(int setup);
}

/// <summary>The clients of one setup: the API key they connect with (null: none) and the hub of each.</summary>
internal sealed record ProbeSetup(string? Key, IReadOnlyList<Uri> Hubs);
