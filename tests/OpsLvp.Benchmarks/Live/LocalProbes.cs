namespace OpsLvp.Benchmarks.Live;

/// <summary><see cref="IProbes"/> in this process: one <see cref="HubProbe"/> per client.</summary>
internal sealed class LocalProbes : IProbes
{
    private readonly List<List<HubProbe>> _setups = [];

    public async Task ConnectAsync(IReadOnlyList<ProbeSetup> setups)
    {
        if (_setups.Count > 0)
        {
            throw new InvalidOperationException($"connected already ({_setups.Count} setups): one connect per set of probes");
        }
        foreach (var setup in setups)
        {
            _setups.Add([.. setup.Hubs.Select(hub => new HubProbe(hub, setup.Key))]);
        }
        using var throttle = new SemaphoreSlim(50);
        await Task.WhenAll(_setups.SelectMany(g => g).Select(async probe =>
        {
            await throttle.WaitAsync();
            try
            {
                await probe.StartAsync();
            }
            finally
            {
                throttle.Release();
            }
        }));
    }

    public Task<long> ArmAsync(int setup, string? marker)
    {
        long before = 0;
        foreach (var probe in Group(setup))
        {
            before += probe.Deliveries;
            probe.Arm(marker);
        }
        return Task.FromResult(before);
    }

    public async Task<long[]> WaitAsync(int setup, TimeSpan timeout)
    {
        var group = Group(setup);
        var all = Task.WhenAll(group.Select(p => p.Received));
        if (await Task.WhenAny(all, Task.Delay(timeout)) != all)
        {
            throw new TimeoutException($"not every client received 'state' within {timeout.TotalSeconds} s ({group.Count(p => p.Received.IsCompleted)}/{group.Count})");
        }
        return await all;
    }

    public Task<(long Deliveries, int PayloadChars)> CountAsync(int setup)
    {
        var group = Group(setup);
        return Task.FromResult((group.Sum(p => p.Deliveries), group.Count == 0 ? 0 : group.Max(p => p.LastPayloadChars)));
    }

    private List<HubProbe> Group(int setup) =>
        setup >= 0 && setup < _setups.Count ? _setups[setup]
            : throw new ArgumentOutOfRangeException(nameof(setup), setup, $"no setup {setup}: {_setups.Count} connected");

    public async ValueTask DisposeAsync() =>
        await Task.WhenAll(_setups.SelectMany(g => g).Select(p => p.DisposeAsync().AsTask()));
}
