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

    /// <summary>Sign-in session lifetime, sliding; default 12 h (one operations shift with margin).</summary>
    public TimeSpan SessionLifetime { get; set; } = TimeSpan.FromHours(12);

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
