using Microsoft.AspNetCore.SignalR;

namespace OpsLvp.Web.Live;

/// <summary>
/// Hub <c>/hubs/lvp</c> (DEVELOPERS.md "Data flow"): server → client <c>state</c> with the <see cref="LiveSnapshot"/> on every
/// change, and the current one on connect. Clients only listen. Who may connect is set in one place:
/// <see cref="LiveApi.HubPolicy"/>.
/// </summary>
public sealed class LvpHub(ILiveState live) : Hub
{
    /// <summary>Client method name of a snapshot.</summary>
    public const string StateMethod = "state";

    public override async Task OnConnectedAsync()
    {
        if (live.Current is { } snapshot)
        {
            await Clients.Caller.SendAsync(StateMethod, snapshot, Context.ConnectionAborted);
        }
        await base.OnConnectedAsync();
    }
}
