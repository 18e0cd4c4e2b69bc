using System.Net;
using Microsoft.Extensions.Options;
using Microsoft.Extensions.Time.Testing;
using OpsLvp.Web.Access;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// <see cref="SignInThrottle"/> on its own, with client addresses from the documentation range of RFC 5737: the
/// per-account limit across all addresses, that its window ends by itself, and the known-address exemption.
/// </summary>
public sealed class SignInThrottleComponentTests
{
    private static readonly IPAddress[] Addresses = Enumerable.Range(1, 20).Select(i => IPAddress.Parse($"198.51.100.{i}")).ToArray();

    private static SignInThrottle Throttle(int perAddress, int allAddresses, TimeSpan window, TimeProvider clock, TimeSpan? knownFor = null) =>
        new(Options.Create(new AccessOptions
        {
            SignInAttemptsPerAccount = perAddress,
            SignInAttemptsPerAccountAllAddresses = allAddresses,
            SignInAccountWindow = window,
            SignInKnownAddressFor = knownFor ?? TimeSpan.FromDays(30),
        }), clock);

    [Fact]
    public void ManyAddresses_ShareTheAccountWideLimit_OtherAccountsAreNotAffected()
    {
        using var throttle = Throttle(perAddress: 3, allAddresses: 10, TimeSpan.FromHours(1), TimeProvider.System);

        var allowed = Addresses.SelectMany(a => Enumerable.Range(0, 3).Select(_ => throttle.TryAttempt("dm.target", a))).Count(ok => ok);

        Assert.Equal(10, allowed);
        // case-insensitive: the same account
        Assert.False(throttle.TryAttempt("DM.Target", Addresses[^1]));
        Assert.True(throttle.TryAttempt("other.person", Addresses[0]));
    }

    [Fact]
    public void OneAddress_IsStillHeldByThePerAddressLimit_BelowTheAccountWideOne()
    {
        using var throttle = Throttle(perAddress: 2, allAddresses: 10, TimeSpan.FromHours(1), TimeProvider.System);

        Assert.True(throttle.TryAttempt("dm.target", Addresses[0]));
        Assert.True(throttle.TryAttempt("dm.target", Addresses[0]));
        Assert.False(throttle.TryAttempt("dm.target", Addresses[0]));
        Assert.True(throttle.TryAttempt("dm.target", Addresses[1]));
    }

    [Fact]
    public async Task TheAccountWideLimit_EndsByItself_WhenItsWindowIsOver()
    {
        using var throttle = Throttle(perAddress: 1, allAddresses: 2, TimeSpan.FromSeconds(1), TimeProvider.System);
        Assert.True(throttle.TryAttempt("dm.target", Addresses[0]));
        Assert.True(throttle.TryAttempt("dm.target", Addresses[1]));
        Assert.False(throttle.TryAttempt("dm.target", Addresses[2]));

        // the fixed window replenishes on a real timer: poll with a generous deadline
        var deadline = DateTime.UtcNow.AddSeconds(30);
        while (!throttle.TryAttempt("dm.target", Addresses[3]))
        {
            Assert.True(DateTime.UtcNow < deadline, "the account-wide limit did not end within 30 s of a 1 s window");
            await Task.Delay(100);
        }
    }

    [Fact]
    public void AKnownAddress_IsNotHeldByTheAccountWideLimit_UntilItIsNoLongerKnown()
    {
        var clock = new FakeTimeProvider(new DateTimeOffset(2026, 1, 1, 0, 0, 0, TimeSpan.Zero));
        using var throttle = Throttle(perAddress: 100, allAddresses: 100, TimeSpan.FromHours(1), clock, knownFor: TimeSpan.FromDays(30));
        var workstation = Addresses[19];
        Assert.True(throttle.TryAttempt("dm.target", workstation));
        throttle.Succeeded("dm.target", workstation);

        // a guesser elsewhere uses up the account-wide limit
        for (var i = 0; i < 99; i++)
        {
            Assert.True(throttle.TryAttempt("dm.target", Addresses[i % 19]));
        }
        Assert.False(throttle.TryAttempt("dm.target", Addresses[0]));

        Assert.True(throttle.TryAttempt("dm.target", workstation));

        clock.Advance(TimeSpan.FromDays(30) + TimeSpan.FromSeconds(1));
        Assert.False(throttle.TryAttempt("dm.target", workstation));
    }
}
