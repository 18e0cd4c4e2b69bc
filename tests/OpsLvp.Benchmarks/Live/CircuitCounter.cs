using Microsoft.AspNetCore.Components.Server.Circuits;

namespace OpsLvp.Benchmarks.Live;

/// <summary>Counts open Blazor circuits in the benchmark server (added by the harness only).</summary>
public sealed class CircuitCounter : CircuitHandler
{
    private int _open;

    public int Open => Volatile.Read(ref _open);

    public override Task OnCircuitOpenedAsync(Circuit circuit, CancellationToken cancellationToken)
    {
        Interlocked.Increment(ref _open);
        return Task.CompletedTask;
    }

    public override Task OnCircuitClosedAsync(Circuit circuit, CancellationToken cancellationToken)
    {
        Interlocked.Decrement(ref _open);
        return Task.CompletedTask;
    }
}
