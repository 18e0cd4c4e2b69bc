using System.Collections.Concurrent;
using System.Net;
using System.Threading.RateLimiting;
using Microsoft.Extensions.Options;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Access;

/// <summary>
/// Sign-in attempts per account (docs/access.md, "Sign-in throttling"), two limits, both in fixed windows of
/// <see cref="AccessOptions.SignInAccountWindow"/> that end by themselves:
/// <list type="bullet">
/// <item>one account from one client address: <see cref="AccessOptions.SignInAttemptsPerAccount"/>;</item>
/// <item>one account from all addresses together: <see cref="AccessOptions.SignInAttemptsPerAccountAllAddresses"/>
/// (higher), so a guesser with many addresses is held too. An address this account signed in from successfully within
/// <see cref="AccessOptions.SignInKnownAddressFor"/> is not held by this one (only by the per-address ones): a guesser
/// elsewhere cannot keep the duty manager out of their own workstation by renewing the limit window after window.</item>
/// </list>
/// Refused attempts never reach the password check, so nobody counts failures against the account. The per-address
/// limit on all accounts is the rate limiting middleware's (<see cref="AccessServiceCollectionExtensions.SignInRateLimit"/>).
/// </summary>
public sealed class SignInThrottle : IDisposable
{
    /// <summary>Known (account, address) pairs kept at most; the oldest go first beyond it.</summary>
    internal const int MaxKnownAddresses = 10_000;

    private readonly PartitionedRateLimiter<string> _perAddress;
    private readonly PartitionedRateLimiter<string> _allAddresses;
    private readonly ConcurrentDictionary<string, DateTimeOffset> _known = new(StringComparer.Ordinal);
    private readonly TimeSpan _knownFor;
    private readonly TimeProvider _clock;

    public SignInThrottle(IOptions<AccessOptions> options, [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider clock)
    {
        ArgumentNullException.ThrowIfNull(options);
        var access = options.Value;
        _clock = clock;
        _knownFor = access.SignInKnownAddressFor;
        _perAddress = Limiter(access.SignInAttemptsPerAccount, access.SignInAccountWindow);
        _allAddresses = Limiter(access.SignInAttemptsPerAccountAllAddresses, access.SignInAccountWindow);
    }

    private static PartitionedRateLimiter<string> Limiter(int permits, TimeSpan window) =>
        PartitionedRateLimiter.Create<string, string>(key => RateLimitPartition.GetFixedWindowLimiter(key, _ => new FixedWindowRateLimiterOptions
        {
            PermitLimit = permits,
            Window = window,
            QueueLimit = 0,
            AutoReplenishment = true,
        }));

    /// <summary>Takes one attempt for <paramref name="userName"/> (case-insensitive) from <paramref name="address"/>; false when throttled.</summary>
    public bool TryAttempt(string userName, IPAddress? address)
    {
        ArgumentNullException.ThrowIfNull(userName);
        using var lease = _perAddress.AttemptAcquire(Key(userName, address));
        if (!lease.IsAcquired)
        {
            return false;
        }
        if (IsKnown(userName, address))
        {
            return true;
        }
        using var accountLease = _allAddresses.AttemptAcquire(userName.ToUpperInvariant());
        return accountLease.IsAcquired;
    }

    /// <summary>Remembers that <paramref name="userName"/> signed in from <paramref name="address"/> (in memory: a restart forgets).</summary>
    public void Succeeded(string userName, IPAddress? address)
    {
        ArgumentNullException.ThrowIfNull(userName);
        if (address is null || _knownFor <= TimeSpan.Zero)
        {
            return;
        }
        var now = _clock.GetUtcNow();
        _known[Key(userName, address)] = now;
        if (_known.Count > MaxKnownAddresses)
        {
            foreach (var (key, _) in _known.Where(k => now - k.Value > _knownFor).ToList())
            {
                _known.TryRemove(key, out _);
            }
            foreach (var (key, _) in _known.OrderBy(k => k.Value).Take(Math.Max(0, _known.Count - MaxKnownAddresses)).ToList())
            {
                _known.TryRemove(key, out _);
            }
        }
    }

    private bool IsKnown(string userName, IPAddress? address) =>
        address is not null && _known.TryGetValue(Key(userName, address), out var at) && _clock.GetUtcNow() - at <= _knownFor;

    private static string Key(string userName, IPAddress? address) =>
        string.Concat(userName.ToUpperInvariant(), "|", address?.ToString() ?? "unknown");

    public void Dispose()
    {
        _perAddress.Dispose();
        _allAddresses.Dispose();
    }
}
