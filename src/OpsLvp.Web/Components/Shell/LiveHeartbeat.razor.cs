using Microsoft.AspNetCore.Components;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Components.Shell;

/// <summary>
/// The heartbeat every live page carries (issue 13, "never a screen that looks live when it is not"). The circuit
/// re-renders a hidden element once per <see cref="ScreenOptions.HeartbeatInterval"/> of real time with a beat
/// counter, the server's clock and the version of the live state; wwwroot-assets/live-watch.js, loaded by every
/// page, watches that element in the browser and, when no beat has arrived for two intervals, shows "NO LIVE DATA
/// since hh:mm:ss" and greys the page. Because the browser judges by what reached it, a stalled network (no bytes,
/// connection still open) is caught as well as a closed connection. Pages rendered without a circuit (sign-in)
/// are not watched.
/// </summary>
public partial class LiveHeartbeat
{
    private ITimer? _timer;
    private readonly string _instance = Guid.NewGuid().ToString("N")[..8];
    private long _beats;

    [Inject]
    private IOptions<ScreenOptions> Options { get; set; } = default!;

    [Inject]
    private ILiveState Live { get; set; } = default!;

    /// <summary>The app clock: the time the page prints (demo time in demo mode).</summary>
    [Inject]
    private TimeProvider Clock { get; set; } = default!;

    /// <summary>Real time for the beat period, never accelerated.</summary>
    [Inject(Key = TimeServiceCollectionExtensions.NetworkClockKey)]
    private TimeProvider RealClock { get; set; } = default!;

    private bool Watch => RendererInfo.IsInteractive || AssignedRenderMode is not null;

    // The instance and the switch from prerendered to interactive count as beats too: a page that just got its circuit is live.
    private string Beat => $"{_instance}-{(RendererInfo.IsInteractive ? "i" : "p")}{_beats}";

    private long IntervalMs => (long)Options.Value.HeartbeatInterval.TotalMilliseconds;

    private string ServerTime => DisplayFormat.UtcClockSeconds(Clock.GetUtcNow());

    private string Version => Live.Current?.Version.ToString(System.Globalization.CultureInfo.InvariantCulture) ?? "";

    protected override void OnAfterRender(bool firstRender)
    {
        if (firstRender)
        {
            var period = Options.Value.HeartbeatInterval;
            _timer = RealClock.CreateTimer(_ => _ = BeatAsync(), null, period, period);
        }
    }

    private async Task BeatAsync()
    {
        try
        {
            await InvokeAsync(() =>
            {
                _beats++;
                StateHasChanged();
            });
        }
        catch (Exception ex)
        {
            await DispatchExceptionAsync(ex);
        }
    }

    public async ValueTask DisposeAsync()
    {
        if (_timer is not null)
        {
            await _timer.DisposeAsync();
        }
        GC.SuppressFinalize(this);
    }
}
