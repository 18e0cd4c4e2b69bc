using System.Globalization;
using System.Security.Claims;
using System.Threading.RateLimiting;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Authentication.Cookies;
using Microsoft.AspNetCore.Components.Authorization;
using Microsoft.AspNetCore.DataProtection;
using Microsoft.AspNetCore.Diagnostics;
using Microsoft.AspNetCore.Http.Features;
using Microsoft.AspNetCore.Identity;
using Microsoft.AspNetCore.SignalR;
using Microsoft.Extensions.Options;
using OpsLvp.Data;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Live;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Access;

public static class AccessServiceCollectionExtensions
{
    /// <summary>Password rules (docs/access.md): length over composition, as NIST SP 800-63B §5.1.1 advises (from memory).</summary>
    public const int MinPasswordLength = 12;

    /// <summary>Failed sign-ins before an account locks (common practice).</summary>
    public const int MaxFailedSignIns = 5;

    /// <summary>How long a locked account stays locked (common practice).</summary>
    public static readonly TimeSpan LockoutDuration = TimeSpan.FromMinutes(15);

    /// <summary>
    /// Registers accounts (Identity on <see cref="OpsLvpDbContext"/>), the sign-in, display and API key schemes, the
    /// policies, circuit and hub revalidation and the first-start/demo account setup. Needs the data layer
    /// (<c>AddLiveEngine</c> registers it).
    /// </summary>
    public static IServiceCollection AddAccess(this IServiceCollection services, IConfiguration configuration)
    {
        services.AddOptions<AccessOptions>()
            .Bind(configuration.GetSection(AccessOptions.SectionName))
            .ValidateShape(configuration, AccessOptions.SectionName)
            .Validate(o => o.RevalidationInterval >= TimeSpan.FromSeconds(1) && o.RevalidationInterval <= TimeSpan.FromSeconds(60),
                "Access:RevalidationInterval must be between 00:00:01 and 00:01:00.")
            .Validate(o => o.SessionLifetime >= TimeSpan.FromSeconds(1) && o.SessionLifetime <= TimeSpan.FromDays(7),
                "Access:SessionLifetime must be between 00:00:01 and 7.00:00:00.")
            .Validate(o => o.SessionIdleTimeout >= TimeSpan.FromSeconds(1) && o.SessionIdleTimeout <= o.SessionLifetime,
                "Access:SessionIdleTimeout must be between 00:00:01 and Access:SessionLifetime.")
            .Validate(o => o.SignInPerAddressPerMinute is >= 1 and <= 10_000,
                "Access:SignInPerAddressPerMinute must be between 1 and 10000.")
            .Validate(o => o.SignInAttemptsPerAccount is >= 1 and <= 1000,
                "Access:SignInAttemptsPerAccount must be between 1 and 1000.")
            .Validate(o => o.SignInAccountWindow >= TimeSpan.FromSeconds(1) && o.SignInAccountWindow <= TimeSpan.FromDays(1),
                "Access:SignInAccountWindow must be between 00:00:01 and 1.00:00:00.")
            .Validate(o => o.SignInAttemptsPerAccountAllAddresses >= o.SignInAttemptsPerAccount && o.SignInAttemptsPerAccountAllAddresses <= 100_000,
                "Access:SignInAttemptsPerAccountAllAddresses must be at least Access:SignInAttemptsPerAccount and at most 100000.")
            .Validate(o => o.SignInKnownAddressFor >= TimeSpan.Zero && o.SignInKnownAddressFor <= TimeSpan.FromDays(365),
                "Access:SignInKnownAddressFor must be between 00:00:00 and 365.00:00:00.")
            .Validate(o => o.DisplayLifetime >= TimeSpan.FromHours(1) && o.DisplayLifetime <= TimeSpan.FromDays(400),
                "Access:DisplayLifetime must be between 01:00:00 and 400.00:00:00.")
            .Validate(o => string.IsNullOrEmpty(o.SetupSecret) || o.SetupSecret.Trim().Length >= 16,
                "Access:SetupSecret must be at least 16 characters.")
            .Validate(o => o.HubMaxMessageBytes is >= 1024 and <= 1024 * 1024,
                "Access:HubMaxMessageBytes must be between 1024 and 1048576.")
            .ValidateOnStart();

        // Live state (hub and GET /api/state) needs a role, a display token or a hub-read key.
        LiveApi.HubPolicy = AccessPolicies.HubRead;

        services.AddIdentityCore<OpsLvpUser>(o =>
            {
                o.Password.RequiredLength = MinPasswordLength;
                o.Password.RequireDigit = false;
                o.Password.RequireLowercase = false;
                o.Password.RequireUppercase = false;
                o.Password.RequireNonAlphanumeric = false;
                o.Password.RequiredUniqueChars = 4;
                o.Lockout.AllowedForNewUsers = true;
                o.Lockout.MaxFailedAccessAttempts = MaxFailedSignIns;
                o.Lockout.DefaultLockoutTimeSpan = LockoutDuration;
                o.User.RequireUniqueEmail = false;
                o.SignIn.RequireConfirmedAccount = false;
            })
            .AddRoles<IdentityRole>()
            .AddEntityFrameworkStores<OpsLvpDbContext>()
            .AddSignInManager<OpsLvpSignInManager>()
            .AddDefaultTokenProviders();

        services.AddAuthentication(o =>
            {
                o.DefaultScheme = AccessSchemes.Selector;
                o.DefaultChallengeScheme = IdentityConstants.ApplicationScheme;
                o.DefaultSignInScheme = IdentityConstants.ApplicationScheme;
            })
            .AddPolicyScheme(AccessSchemes.Selector, "OpsLvp", o => o.ForwardDefaultSelector = SelectScheme)
            .AddCookie(AccessSchemes.Display, _ => { })
            .AddScheme<AuthenticationSchemeOptions, ApiKeyAuthenticationHandler>(AccessSchemes.ApiKey, _ => { })
            .AddIdentityCookies();
        services.AddOptions<CookieAuthenticationOptions>(IdentityConstants.ApplicationScheme).Configure<IOptions<AccessOptions>>((o, access) =>
        {
            ConfigureCookie(o, AccessSchemes.SessionCookieName, access.Value.SessionIdleTimeout);
            o.LoginPath = "/signin";
            o.LogoutPath = "/signout";
            o.AccessDeniedPath = "/access-denied";
            // Replaces Identity's interval-based stamp check: every request is checked, so a sign-out, a password or
            // role change, or a disabled account ends a copied cookie at once (docs/access.md, "Sessions").
            o.Events.OnSigningIn = context =>
            {
                context.Properties.Items.TryAdd(SessionStartedItem, TimeProvider.System.GetUtcNow().ToString("O", CultureInfo.InvariantCulture));
                return Task.CompletedTask;
            };
            o.Events.OnValidatePrincipal = ValidateSessionAsync;
        });
        services.AddOptions<CookieAuthenticationOptions>(AccessSchemes.Display).Configure<IOptions<AccessOptions>>((o, access) =>
        {
            ConfigureCookie(o, AccessSchemes.DisplayCookieName, access.Value.DisplayLifetime);
            o.LoginPath = "/signin";
            o.AccessDeniedPath = "/access-denied";
            o.Events.OnValidatePrincipal = async context =>
            {
                var validator = context.HttpContext.RequestServices.GetRequiredService<AccessValidator>();
                if (context.Principal is null || !await validator.IsStillValidAsync(context.Principal, context.HttpContext.RequestAborted))
                {
                    context.RejectPrincipal();
                    await context.HttpContext.SignOutAsync(AccessSchemes.Display);
                }
            };
        });
        services.AddOptions<AuthenticationSchemeOptions>(AccessSchemes.ApiKey).Configure(o => o.TimeProvider = TimeProvider.System);
        services.AddOptions<SecurityStampValidatorOptions>().Configure<IOptions<AccessOptions>>((o, access) =>
        {
            o.ValidationInterval = access.Value.RevalidationInterval;
            o.TimeProvider = TimeProvider.System;
        });

        services.AddAuthorizationBuilder()
            .AddPolicy(AccessPolicies.Console, p => p.RequireRole(Roles.DutyManager))
            .AddPolicy(AccessPolicies.Actions, p => p.RequireRole(Roles.GroundStaff, Roles.DutyManager))
            .AddPolicy(AccessPolicies.Admin, p => p.RequireRole(Roles.Administrator))
            .AddPolicy(AccessPolicies.Wall, p => p.RequireAssertion(c => AccessPolicies.MayViewLiveData(c.User)))
            .AddPolicy(AccessPolicies.Review, p => p.RequireAssertion(c => HasAnyRole(c.User)))
            .AddPolicy(AccessPolicies.HubRead, p => p.RequireAssertion(c =>
                HasAnyRole(c.User) || c.User.HasClaim(h => h.Type == AccessClaims.DisplayToken) || c.User.HasClaim(AccessClaims.Scope, ApiKeyStore.HubReadScope)))
            .AddPolicy(AccessPolicies.Ingest, p => p.RequireClaim(AccessClaims.Scope, ApiKeyStore.IngestScope));

        // The key ring that protects session cookies and antiforgery tokens lives in the database (table
        // data_protection_keys), not the user profile: a re-created container keeps everyone signed in and forms valid.
        services.AddDataProtection()
            .SetApplicationName("OpsLvp")
            .PersistKeysToDbContext<OpsLvpDbContext>();

        services.AddCascadingAuthenticationState();
        services.AddScoped<AuthenticationStateProvider, AccessRevalidatingAuthenticationStateProvider>();
        services.AddSingleton<AccessValidator>();
        services.AddSingleton<SignInThrottle>();
        services.AddSingleton<SignInFailureAudit>();
        services.AddHostedService(sp => sp.GetRequiredService<SignInFailureAudit>());
        services.AddRateLimiter(o =>
        {
            o.RejectionStatusCode = StatusCodes.Status429TooManyRequests;
            o.GlobalLimiter = PartitionedRateLimiter.Create<HttpContext, string>(SignInRateLimit);
            o.OnRejected = async (context, cancellationToken) =>
            {
                context.HttpContext.Response.Headers.RetryAfter = "60";
                context.HttpContext.Response.ContentType = "text/plain; charset=utf-8";
                await context.HttpContext.Response.WriteAsync("Too many sign-in attempts from this address; wait a minute and try again.", cancellationToken);
            };
        });
        services.AddSingleton<AccessAudit>();
        services.AddSingleton<SetupGate>();
        services.AddSingleton<DemoAccounts>();
        services.AddScoped<UserAdmin>();
        services.AddSingleton<ProfileTeamList>();
        services.AddSingleton<CredentialAdmin>();
        services.AddSingleton<HubConnectionMonitor>();
        services.AddHostedService(sp => sp.GetRequiredService<HubConnectionMonitor>());
        services.AddHostedService<AccessStartup>();

        // Global, because a filter added to HubOptions<LvpHub> alone was not applied; the filter itself passes every
        // hub but LvpHub straight through (Blazor's circuit hub keeps StartCircuit and its own access).
        services.Configure<HubOptions>(o => o.AddFilter<HubAccessFilter>());
        services.AddSingleton<HubAccessFilter>();
        services.AddOptions<HubOptions>().Configure<IOptions<AccessOptions>>((o, access) => o.MaximumReceiveMessageSize = access.Value.HubMaxMessageBytes);
        services.Configure<FormOptions>(o =>
        {
            o.ValueLengthLimit = 16 * 1024;
            o.MultipartBodyLengthLimit = 1024 * 1024;
        });
        services.AddAntiforgery(o =>
        {
            o.Cookie.Name = ".OpsLvp.Antiforgery";
            o.Cookie.HttpOnly = true;
            o.Cookie.SameSite = SameSiteMode.Strict;
            o.Cookie.SecurePolicy = CookieSecurePolicy.SameAsRequest;
        });
        return services;
    }

    /// <summary>
    /// HTTPS redirection and HSTS when <c>Access:HttpsRedirection</c> is on, authentication and authorisation. Call
    /// before <c>UseAntiforgery</c>; <see cref="SecurityHeaders.UseSecurityHeaders"/> goes first in the pipeline.
    /// </summary>
    public static WebApplication UseAccess(this WebApplication app)
    {
        if (app.Services.GetRequiredService<IOptions<AccessOptions>>().Value.HttpsRedirection)
        {
            app.UseHsts();
            app.UseHttpsRedirection();
        }
        app.UseRateLimiter();
        app.UseAuthentication();
        app.UseAuthorization();
        return app;
    }

    /// <summary>Authentication property holding when the session began (UTC, round-trip text); survives sliding renewal.</summary>
    public const string SessionStartedItem = ".opslvp.signedInAt";

    /// <summary>
    /// The per-address sign-in limit (ASP.NET Core rate limiting): form posts to <c>/signin</c>, counted per client
    /// address in one-minute windows (<see cref="AccessOptions.SignInPerAddressPerMinute"/>); every other request passes.
    /// </summary>
    public static RateLimitPartition<string> SignInRateLimit(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (!HttpMethods.IsPost(context.Request.Method) || !context.Request.Path.Equals("/signin", StringComparison.OrdinalIgnoreCase))
        {
            return RateLimitPartition.GetNoLimiter("");
        }
        var limit = context.RequestServices.GetRequiredService<IOptions<AccessOptions>>().Value.SignInPerAddressPerMinute;
        return RateLimitPartition.GetFixedWindowLimiter(context.Connection.RemoteIpAddress?.ToString() ?? "unknown", _ => new FixedWindowRateLimiterOptions
        {
            PermitLimit = limit,
            Window = TimeSpan.FromMinutes(1),
            QueueLimit = 0,
            AutoReplenishment = true,
        });
    }

    /// <summary>
    /// Every request with a session cookie: past <see cref="AccessOptions.SessionLifetime"/> since the sign-in, or no longer
    /// valid for <see cref="AccessValidator"/> (signed out, password or roles changed, disabled, removed), the cookie is
    /// rejected and cleared.
    /// </summary>
    private static async Task ValidateSessionAsync(CookieValidatePrincipalContext context)
    {
        var services = context.HttpContext.RequestServices;
        var lifetime = services.GetRequiredService<IOptions<AccessOptions>>().Value.SessionLifetime;
        var started = context.Properties.Items.TryGetValue(SessionStartedItem, out var text)
            && DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.RoundtripKind, out var at)
                ? at
                : context.Properties.IssuedUtc;
        var valid = started is { } s && TimeProvider.System.GetUtcNow() - s <= lifetime
            && context.Principal is not null
            && await services.GetRequiredService<AccessValidator>().IsStillValidAsync(context.Principal, context.HttpContext.RequestAborted);
        if (!valid)
        {
            context.RejectPrincipal();
            await context.HttpContext.SignOutAsync(IdentityConstants.ApplicationScheme);
        }
    }

    internal static bool HasAnyRole(ClaimsPrincipal user) => AccessStartup.AllRoles.Any(user.IsInRole);

    private static string SelectScheme(HttpContext context)
    {
        if (context.Request.Headers.ContainsKey(ApiKeyAuthenticationHandler.Header))
        {
            return AccessSchemes.ApiKey;
        }
        if (!context.Request.Cookies.ContainsKey(AccessSchemes.SessionCookieName) && context.Request.Cookies.ContainsKey(AccessSchemes.DisplayCookieName))
        {
            return AccessSchemes.Display;
        }
        return IdentityConstants.ApplicationScheme;
    }

    private static void ConfigureCookie(CookieAuthenticationOptions o, string name, TimeSpan lifetime)
    {
        o.Cookie.Name = name;
        o.Cookie.HttpOnly = true;
        o.Cookie.SameSite = SameSiteMode.Strict;
        o.Cookie.SecurePolicy = CookieSecurePolicy.SameAsRequest;
        o.ExpireTimeSpan = lifetime;
        o.SlidingExpiration = true;
        // Session lifetimes are real time, also in demo mode where the app clock runs fast.
        o.TimeProvider = TimeProvider.System;
        o.Events.OnRedirectToLogin = context => ApiAwareRedirect(context, StatusCodes.Status401Unauthorized);
        o.Events.OnRedirectToAccessDenied = context => ApiAwareRedirect(context, StatusCodes.Status403Forbidden);
    }

    /// <summary>APIs and the hub answer 401/403; pages redirect to sign-in.</summary>
    private static Task ApiAwareRedirect(RedirectContext<CookieAuthenticationOptions> context, int status)
    {
        var path = context.Request.Path;
        if (path.StartsWithSegments("/api") || path.StartsWithSegments("/hubs") || path.StartsWithSegments("/health"))
        {
            context.Response.StatusCode = status;
            // Machine clients get the bare status, not the not-found page re-executed in its place.
            if (context.HttpContext.Features.Get<IStatusCodePagesFeature>() is { } pages)
            {
                pages.Enabled = false;
            }
            return Task.CompletedTask;
        }
        context.Response.Redirect(context.RedirectUri);
        return Task.CompletedTask;
    }
}
