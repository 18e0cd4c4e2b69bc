namespace OpsLvp.Web.Live;

/// <summary>
/// The in-process notifier for Blazor circuits (singleton). A component reads <see cref="Current"/> on
/// first render and subscribes in <c>OnAfterRenderAsync(firstRender)</c>; the handler marshals with
/// <c>InvokeAsync</c> and the subscription is disposed with the component.
/// </summary>
public interface ILiveState
{
    /// <summary>The latest snapshot; null only before the engine host has published once.</summary>
    LiveSnapshot? Current { get; }

    /// <summary>Calls <paramref name="onChange"/> with every new snapshot until the returned handle is disposed.</summary>
    IDisposable Subscribe(Func<LiveSnapshot, Task> onChange);
}
