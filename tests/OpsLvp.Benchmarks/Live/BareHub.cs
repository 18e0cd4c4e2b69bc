using Microsoft.AspNetCore.SignalR;

namespace OpsLvp.Benchmarks.Live;

/// <summary>A hub with no behaviour: the bare-broadcast baseline for the push latency harness.</summary>
public sealed class BareHub : Hub;
