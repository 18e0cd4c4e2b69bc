using System.Security.Cryptography;
using System.Text;

namespace OpsLvp.Web.Access;

/// <summary>
/// The first-start setup of a real installation: while no account exists, <c>/setup</c> accepts the one-time secret
/// (from configuration, <see cref="AccessOptions.SetupSecretVariable"/>, or printed once at start) and creates the
/// first administrator. Closed once any account exists, and in demo mode.
/// </summary>
public sealed class SetupGate
{
    private readonly Lock _lock = new();
    private byte[]? _secret;

    /// <summary>True while setup may be used (set at start by <see cref="AccessStartup"/>).</summary>
    public bool IsOpen
    {
        get
        {
            lock (_lock)
            {
                return _secret is not null;
            }
        }
    }

    internal void Open(string secret)
    {
        lock (_lock)
        {
            _secret = Encoding.UTF8.GetBytes(secret);
        }
    }

    /// <summary>Closes setup for good (the first account exists).</summary>
    public void Close()
    {
        lock (_lock)
        {
            _secret = null;
        }
    }

    /// <summary>Constant-time comparison of the presented secret; false when closed.</summary>
    public bool Matches(string? presented)
    {
        lock (_lock)
        {
            return _secret is not null && presented is not null
                && CryptographicOperations.FixedTimeEquals(_secret, Encoding.UTF8.GetBytes(presented.Trim()));
        }
    }
}
