using System.Text.Json;
using System.Threading.Channels;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>Reading the hub's state messages that a test collects into a channel.</summary>
public static class StateChannels
{
    /// <summary>The next state that matches, skipping the others; cancelled after <paramref name="patience"/> (60 s unless given).</summary>
    public static async Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match, TimeSpan? patience = null)
    {
        ArgumentNullException.ThrowIfNull(states);
        ArgumentNullException.ThrowIfNull(match);
        using var cts = new CancellationTokenSource(patience ?? TimeSpan.FromSeconds(60));
        while (true)
        {
            var state = await states.Reader.ReadAsync(cts.Token);
            if (match(state))
            {
                return state;
            }
        }
    }
}
