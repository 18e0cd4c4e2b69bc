using Microsoft.AspNetCore.Components;
using Microsoft.JSInterop;
using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Components.Shared;

/// <summary>
/// The audible cue for alarms (issue "People" item 4): a chime (wwwroot-assets/alarm-sound.js, Web Audio) once for
/// every newly raised unacknowledged alarm in <see cref="Alarms"/>, and a mute toggle remembered per screen
/// (<see cref="ScreenKey"/>, localStorage). Used by the alarm strip's audible mode and by the wall.
/// Alarms already raised when the cue loads chime once too: a screen opened during an alarm announces it.
/// </summary>
public partial class AlarmCue
{
    /// <summary>The browser module that plays the chime and stores the mute choice.</summary>
    public const string ModulePath = "/assets/alarm-sound.js";

    private readonly HashSet<string> _heard = new(StringComparer.Ordinal);
    private IJSObjectReference? _module;
    private DotNetObjectReference<AlarmCue>? _self;
    private bool _muted;
    private bool _soundAllowed;

    [Inject]
    private IJSRuntime Js { get; set; } = default!;

    /// <summary>The alarms shown on the screen right now, acknowledged ones included.</summary>
    [Parameter]
    public IReadOnlyList<Alarm> Alarms { get; set; } = [];

    /// <summary>Names the screen whose mute choice is remembered (localStorage).</summary>
    [Parameter]
    public string ScreenKey { get; set; } = "default";

    /// <summary>What the toggle calls the sound: "{Label} on" / "{Label} off".</summary>
    [Parameter]
    public string Label { get; set; } = "Sound";

    /// <summary>A small button (the wall's header) instead of the large touch-size one.</summary>
    [Parameter]
    public bool Compact { get; set; }

    /// <summary>Extra CSS class on the button.</summary>
    [Parameter]
    public string? Class { get; set; }

    /// <summary>How many chimes this cue has asked the browser for (for diagnostics).</summary>
    internal int ChimeCount { get; private set; }

    private string ButtonClass => $"alarm-mute-button {Class}".Trim();

    protected override async Task OnParametersSetAsync()
    {
        if (_module is not null)
        {
            await NoticeAsync();
        }
    }

    protected override async Task OnAfterRenderAsync(bool firstRender)
    {
        if (!firstRender)
        {
            return;
        }
        var module = await Js.InvokeAsync<IJSObjectReference>("import", ModulePath);
        _muted = await module.InvokeAsync<bool>("isMuted", ScreenKey);
        _self = DotNetObjectReference.Create(this);
        _soundAllowed = await module.InvokeAsync<bool>("watchSound", _self);
        // Only now may parameter updates chime: the mute choice is known.
        _module = module;
        await NoticeAsync();
        StateHasChanged();
    }

    private async Task NoticeAsync()
    {
        var fresh = Alarms.Where(a => !a.Acknowledged).Select(AlarmLabels.Identity).Where(_heard.Add).ToList();
        if (fresh.Count > 0 && !_muted && _module is not null)
        {
            ChimeCount++;
            await _module.InvokeAsync<bool>("chime");
        }
    }

    /// <summary>The browser allows or blocks sound now (called from alarm-sound.js).</summary>
    [JSInvokable]
    public Task SoundStateChanged(bool allowed) => InvokeAsync(() =>
    {
        _soundAllowed = allowed;
        StateHasChanged();
    });

    /// <summary>
    /// What the toggle says: "{Label} off" when muted, "{Label} on" only while the browser really plays sound,
    /// else "Tap to enable sound" (an untouched kiosk must not claim a sound it cannot make).
    /// </summary>
    internal string ButtonText => _muted ? $"{Label} off" : _soundAllowed ? $"{Label} on" : "Tap to enable sound";

    /// <summary>True when the toggle asks for a tap before sound can play.</summary>
    internal bool NeedsTap => !_muted && !_soundAllowed;

    private async Task ToggleMuteAsync()
    {
        if (NeedsTap && _module is not null)
        {
            // This tap is the gesture the browser waited for: ask for sound rather than muting.
            _soundAllowed = await _module.InvokeAsync<bool>("soundAllowed");
            return;
        }
        _muted = !_muted;
        if (_module is not null)
        {
            await _module.InvokeVoidAsync("setMuted", ScreenKey, _muted);
        }
    }

    public async ValueTask DisposeAsync()
    {
        _self?.Dispose();
        if (_module is not null)
        {
            try
            {
                await _module.DisposeAsync();
            }
            catch (JSDisconnectedException)
            {
                // the circuit is gone: nothing to release in the browser
            }
        }
        GC.SuppressFinalize(this);
    }
}
