namespace OpsLvp.Web.Access;

/// <summary>Configuration section <c>Access</c>: sign-in, sessions and the first-start setup.</summary>
public sealed class AccessOptions
{
    public const string SectionName = "Access";

    /// <summary>Environment variable that may carry the one-time setup secret instead of a printed one.</summary>
    public const string SetupSecretVariable = "OPSLVP_SETUP_SECRET";

    /// <summary>
    /// How often open sessions (Blazor circuits, hub connections, cookies) are checked against the user store, so a
    /// removed role, a disabled account or a revoked display token ends them. 1 s to 60 s; default 30 s.
    /// </summary>
    public TimeSpan RevalidationInterval { get; set; } = TimeSpan.FromSeconds(30);

    /// <summary>
    /// Absolute sign-in session lifetime from the sign-in, however busy the session; default 12 h (one operations shift
    /// with margin). 1 s to 7 days (values under a minute are for tests).
    /// </summary>
    public TimeSpan SessionLifetime { get; set; } = TimeSpan.FromHours(12);

    /// <summary>
    /// A session with no request for this long ends (sliding); default 4 h. At most <see cref="SessionLifetime"/>. An
    /// open screen keeps its circuit; the next page load after the idle time asks for the sign-in again.
    /// </summary>
    public TimeSpan SessionIdleTimeout { get; set; } = TimeSpan.FromHours(4);

    /// <summary>Sign-in form posts accepted per client address per minute (all accounts); more get 429. Default 10.</summary>
    public int SignInPerAddressPerMinute { get; set; } = 10;

    /// <summary>
    /// Sign-in attempts for one account from one client address per <see cref="SignInAccountWindow"/>; more are refused
    /// without checking the password. Default 5. This throttle replaces an account lockout (docs/access.md).
    /// </summary>
    public int SignInAttemptsPerAccount { get; set; } = 5;

    /// <summary>Window of <see cref="SignInAttemptsPerAccount"/> and <see cref="SignInAttemptsPerAccountAllAddresses"/>; default 15 min.</summary>
    public TimeSpan SignInAccountWindow { get; set; } = TimeSpan.FromMinutes(15);

    /// <summary>
    /// Sign-in attempts for one account from all client addresses together per <see cref="SignInAccountWindow"/>; more
    /// are refused like the per-address ones, except from an address the account signed in from within
    /// <see cref="SignInKnownAddressFor"/>. Default 30, at least <see cref="SignInAttemptsPerAccount"/> (docs/access.md).
    /// </summary>
    public int SignInAttemptsPerAccountAllAddresses { get; set; } = 30;

    /// <summary>
    /// How long an address an account signed in from stays exempt from <see cref="SignInAttemptsPerAccountAllAddresses"/>
    /// for that account (kept in memory); default 30 days; zero turns the exemption off.
    /// </summary>
    public TimeSpan SignInKnownAddressFor { get; set; } = TimeSpan.FromDays(30);

    /// <summary>Display (kiosk) cookie lifetime, sliding; default 30 days. Revocation still ends it at once.</summary>
    public TimeSpan DisplayLifetime { get; set; } = TimeSpan.FromDays(30);

    /// <summary>
    /// One-time setup secret for the first administrator of a real installation. When empty, the
    /// <see cref="SetupSecretVariable"/> environment variable is used, else a random one is printed once at start.
    /// </summary>
    public string? SetupSecret { get; set; }

    /// <summary>Demo accounts file, used only in demo mode.</summary>
    public string DemoUsersPath { get; set; } = "seed-demo/users.json";

    /// <summary>Redirect HTTP to HTTPS and send HSTS. Off by default (a reverse proxy usually terminates TLS).</summary>
    public bool HttpsRedirection { get; set; }

    /// <summary>Largest SignalR message a client may send (bytes); default 32 KiB.</summary>
    public long HubMaxMessageBytes { get; set; } = 32 * 1024;
}
