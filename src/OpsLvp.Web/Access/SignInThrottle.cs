using System.Net;
using System.Threading.RateLimiting;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Access;

/// <summary>
/// Sign-in attempts per account and client address (docs/access.md, "Sign-in throttling"): at most
/// <see cref="AccessOptions.SignInAttemptsPerAccount"/> per <see cref="AccessOptions.SignInAccountWindow"/> for one
/// account from one address. Refused attempts never reach the password check, so nobody counts failures against the
/// account: a client elsewhere cannot lock the duty manager out. The per-address limit on all accounts is the rate
/// limiting middleware's (<see cref="AccessServiceCollectionExtensions.SignInRateLimit"/>).
/// </summary>
public sealed class SignInThrottle : IDisposable
{
    private readonly PartitionedRateLimiter<string> _limiter;

    public SignInThrottle(IOptions<AccessOptions> options)
    {
        var access = options.Value;
        _limiter = PartitionedRateLimiter.Create<string, string>(key => RateLimitPartition.GetFixedWindowLimiter(key, _ => new FixedWindowRateLimiterOptions
        {
            PermitLimit = access.SignInAttemptsPerAccount,
            Window = access.SignInAccountWindow,
            QueueLimit = 0,
            AutoReplenishment = true,
        }));
    }

    /// <summary>Takes one attempt for <paramref name="userName"/> (case-insensitive) from <paramref name="address"/>; false when throttled.</summary>
    public bool TryAttempt(string userName, IPAddress? address)
    {
        ArgumentNullException.ThrowIfNull(userName);
        using var lease = _limiter.AttemptAcquire(Key(userName, address));
        return lease.IsAcquired;
    }

    private static string Key(string userName, IPAddress? address) =>
        string.Concat(userName.ToUpperInvariant(), "|", address?.ToString() ?? "unknown");

    public void Dispose() => _limiter.Dispose();
}
