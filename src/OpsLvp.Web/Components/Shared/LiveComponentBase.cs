using Microsoft.AspNetCore.Components;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Shared;

/// <summary>
/// A component fed by <see cref="ILiveState"/>: subscribes after the first render (catching a snapshot that
/// arrived in between), marshals each snapshot onto the renderer with <c>InvokeAsync</c>, ignores snapshots
/// older than the one shown, passes errors to the error boundary, and unsubscribes on dispose.
/// </summary>
public abstract class LiveComponentBase : ComponentBase, IDisposable
{
    private IDisposable? _subscription;
    private long? _shownVersion;

    [Inject]
    protected ILiveState Live { get; set; } = default!;

    /// <summary>Shows <paramref name="snapshot"/> unless it is null or older than the one shown; true when shown.</summary>
    protected bool ShowSnapshot(LiveSnapshot? snapshot)
    {
        if (snapshot is null || (_shownVersion is { } shown && snapshot.Version < shown))
        {
            return false;
        }
        _shownVersion = snapshot.Version;
        OnSnapshot(snapshot);
        return true;
    }

    /// <summary>Takes a snapshot at least as new as the last one shown into the component's fields.</summary>
    protected abstract void OnSnapshot(LiveSnapshot snapshot);

    protected override void OnAfterRender(bool firstRender)
    {
        if (firstRender)
        {
            _subscription = Live.Subscribe(OnSnapshotAsync);
            if (Live.Current is { } current && current.Version != _shownVersion)
            {
                ShowSnapshot(current);
                StateHasChanged();
            }
        }
    }

    private Task OnSnapshotAsync(LiveSnapshot snapshot) => InvokeAsync(async () =>
    {
        try
        {
            ShowSnapshot(snapshot);
            StateHasChanged();
        }
        catch (Exception ex)
        {
            await DispatchExceptionAsync(ex);
        }
    });

    public void Dispose()
    {
        _subscription?.Dispose();
        GC.SuppressFinalize(this);
    }
}
