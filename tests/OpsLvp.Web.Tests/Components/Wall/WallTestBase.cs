using Bunit;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using MudBlazor.Services;
using OpsLvp.Web.Live;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>Shared bUnit setup for the wall: MudBlazor services, a fake clock at the snapshots' instant, a fake live state.</summary>
public abstract class WallTestBase : BunitContext
{
    protected WallTestBase()
    {
        JSInterop.Mode = JSRuntimeMode.Loose;
        Services.AddMudServices();
        Services.AddSingleton<TimeProvider>(Clock);
        Services.AddSingleton(new DemoMode(false, 1));
        Services.AddSingleton<ILiveState>(Live);
    }

    protected FakeTimeProvider Clock { get; } = new(WallSnapshots.At);

    protected FakeLiveState Live { get; } = new();

    protected IRenderedComponent<Web.Components.Pages.Wall.Wall> RenderWall(LiveSnapshot? initial)
    {
        Live.SetInitial(initial);
        return Render<Web.Components.Pages.Wall.Wall>();
    }
}
