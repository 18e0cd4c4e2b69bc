using System.Security.Claims;
using Bunit;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Time.Testing;
using MudBlazor.Services;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Components.Testing;

/// <summary>Shared bUnit setup (disposed asynchronously): MudBlazor services, loose JS interop, the test live state and command service, and sign-in helpers.</summary>
public abstract class LiveComponentTest : BunitContext, IAsyncLifetime
{
    protected LiveComponentTest()
    {
        JSInterop.Mode = JSRuntimeMode.Loose;
        Services.AddMudServices();
        Services.AddSingleton<ILiveState>(Live);
        Services.AddSingleton<ILvpCommandService>(Commands);
        Services.AddSingleton<ICommandPreview>(Previews);
        Services.AddSingleton<TimeProvider>(Clock);
    }

    /// <summary>The server's clock, at the test snapshots' instant.</summary>
    protected FakeTimeProvider Clock { get; } = new(TestSnapshots.T0);

    protected TestLiveState Live { get; } = new();

    protected TestCommandService Commands { get; } = new();

    /// <summary>The console's "what would this command do": none unless a test gives it a real engine and state.</summary>
    protected TestCommandPreview Previews { get; } = new();

    /// <summary>Signs in <paramref name="name"/> with a role and team claims (values as in <see cref="Roles"/> and profile team ids).</summary>
    protected void SignIn(string name, string role, params string[] teams)
    {
        var auth = AddAuthorization();
        auth.SetAuthorized(name);
        auth.SetRoles(role);
        auth.SetClaims([.. teams.Select(t => new Claim(CommandCaller.TeamClaimType, t))]);
    }

    protected void SignedOut() => AddAuthorization();

    public Task InitializeAsync() => Task.CompletedTask;

    // MudBlazor's popover and pointer services are async-disposable only: the container must be disposed asynchronously.
    Task IAsyncLifetime.DisposeAsync() => DisposeAsync().AsTask();
}
