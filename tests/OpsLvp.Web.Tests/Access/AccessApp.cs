using System.Security.Claims;
using Microsoft.AspNetCore.Identity;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Core.Audit;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Helpers over a running <see cref="OpsLvpApp"/>: create accounts, read the audit, make principals.</summary>
public static class AccessApp
{
    /// <summary>Invented test password (meets the 12-character rule).</summary>
    public const string Password = "fog-bank-test-0001";

    public const string SetupSecret = "invented-setup-secret-0123456789";

    /// <summary>A real (non-demo) app with a 2 s revalidation interval and a known setup secret.</summary>
    public static OpsLvpApp Start(IDictionary<string, string?>? extra = null, string? dataFolder = null, Action<IServiceCollection>? services = null,
        string environment = "Development")
    {
        var settings = new Dictionary<string, string?>
        {
            ["Access:RevalidationInterval"] = "00:00:02",
            ["Access:SetupSecret"] = SetupSecret,
            // Every test client signs in from 127.0.0.1; the throttle tests set their own limits.
            ["Access:SignInPerAddressPerMinute"] = "1000",
            ["Access:SignInAttemptsPerAccount"] = "1000",
            ["Access:SignInAttemptsPerAccountAllAddresses"] = "1000",
        };
        foreach (var (key, value) in extra ?? new Dictionary<string, string?>())
        {
            settings[key] = value;
        }
        return OpsLvpApp.Start(settings, dataFolder, services, environment);
    }

    public static async Task<string> CreateUserAsync(this OpsLvpApp app, string userName, string role, params string[] teams)
    {
        using var scope = app.Services.CreateScope();
        var admin = scope.ServiceProvider.GetRequiredService<UserAdmin>();
        var result = await admin.CreateAsync("test-setup", userName, userName + " (invented)", Password, [role], teams);
        Assert.True(result.Succeeded, string.Join("; ", result.Errors));
        var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
        return (await users.FindByNameAsync(userName))!.Id;
    }

    public static async Task<ClaimsPrincipal> PrincipalOfAsync(this OpsLvpApp app, string userName)
    {
        using var scope = app.Services.CreateScope();
        var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
        var factory = scope.ServiceProvider.GetRequiredService<IUserClaimsPrincipalFactory<OpsLvpUser>>();
        return await factory.CreateAsync((await users.FindByNameAsync(userName))!);
    }

    public static async Task<T> WithAdminAsync<T>(this OpsLvpApp app, Func<UserAdmin, Task<T>> action)
    {
        using var scope = app.Services.CreateScope();
        return await action(scope.ServiceProvider.GetRequiredService<UserAdmin>());
    }

    public static async Task<IReadOnlyList<AuditEntry>> AuditAsync(this OpsLvpApp app)
    {
        var store = app.Services.GetRequiredService<AuditStore>();
        var head = await store.GetHeadAsync();
        return head is null ? [] : await store.GetRangeAsync(1, head.Sequence);
    }

    public static async Task<string> DatabaseTextAsync(this OpsLvpApp app)
    {
        var factory = app.Services.GetRequiredService<IDbContextFactory<OpsLvpDbContext>>();
        await using var db = await factory.CreateDbContextAsync();
        var keys = await db.ApiKeys.AsNoTracking().ToListAsync();
        var displays = await db.DisplayTokens.AsNoTracking().ToListAsync();
        return string.Join("\n", keys.Select(k => $"{k.Name} {k.KeyHash} {k.Scopes}").Concat(displays.Select(d => $"{d.Name} {d.TokenHash}")));
    }

    public static ClaimsPrincipal Anonymous { get; } = new(new ClaimsIdentity());

    public static bool CanTick(ClaimsPrincipal principal) => CommandCaller.FromPrincipal(principal).IsInRole(Roles.GroundStaff);
}
