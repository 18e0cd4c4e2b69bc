using System.Security.Cryptography;
using System.Text.Json;
using Microsoft.AspNetCore.Identity;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Access;

/// <summary>
/// At start: migrates the database, makes sure the four roles exist, then either seeds the demo accounts with fresh
/// generated passwords (demo mode; printed, marked DEMO-ONLY) or, in a real installation, disables any demo accounts
/// left over and opens <see cref="SetupGate"/> when there is no account yet.
/// </summary>
public sealed class AccessStartup(
    IServiceScopeFactory scopes,
    IDbContextFactory<OpsLvpDbContext> factory,
    DemoMode demo,
    DemoAccounts demoAccounts,
    SetupGate setup,
    ContentPaths paths,
    IOptions<AccessOptions> options,
    TimeProvider clock,
    ILogger<AccessStartup> logger) : IHostedService
{
    public static IReadOnlyList<string> AllRoles { get; } = [Roles.Administrator, Roles.DutyManager, Roles.GroundStaff, Roles.Viewer];

    public async Task StartAsync(CancellationToken cancellationToken)
    {
        await DatabaseStartup.MigrateAndCheckAsync(factory, cancellationToken);
        using var scope = scopes.CreateScope();
        var roles = scope.ServiceProvider.GetRequiredService<RoleManager<IdentityRole>>();
        foreach (var role in AllRoles)
        {
            if (!await roles.RoleExistsAsync(role))
            {
                Check(await roles.CreateAsync(new IdentityRole(role)), $"create role {role}");
            }
        }
        var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
        if (demo.Enabled)
        {
            await SeedDemoAsync(users, cancellationToken);
            return;
        }
        await DisableDemoAccountsAsync(users, cancellationToken);
        if (!await users.Users.AnyAsync(cancellationToken))
        {
            OpenSetup();
        }
    }

    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    /// <summary>A readable random password of 19 characters (about 82 bits), e.g. <c>k3m9-x2pq-...</c>.</summary>
    public static string NewPassword()
    {
        const string alphabet = "abcdefghjkmnpqrstuvwxyz23456789";
        var chars = new char[19];
        for (var i = 0; i < chars.Length; i++)
        {
            chars[i] = i % 5 == 4 ? '-' : alphabet[RandomNumberGenerator.GetInt32(alphabet.Length)];
        }
        return new string(chars);
    }

    private void OpenSetup()
    {
        var configured = options.Value.SetupSecret;
        if (string.IsNullOrWhiteSpace(configured))
        {
            configured = Environment.GetEnvironmentVariable(AccessOptions.SetupSecretVariable);
        }
        if (!string.IsNullOrWhiteSpace(configured))
        {
            setup.Open(configured.Trim());
            logger.LogWarning("No account exists yet: open /setup with the setup secret from {Variable} or Access:SetupSecret to create the first administrator.", AccessOptions.SetupSecretVariable);
            return;
        }
        var secret = Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(16));
        setup.Open(secret);
        // Printed to the console only (not the log pipeline), once; useless after the first administrator exists.
        Console.Out.WriteLine($"""
            ==== OpsLvp first start ====
            No account exists. Open /setup and enter this one-time setup secret to create the first administrator:
                {secret}
            ============================
            """);
    }

    private async Task SeedDemoAsync(UserManager<OpsLvpUser> users, CancellationToken cancellationToken)
    {
        var file = paths.Resolve(options.Value.DemoUsersPath);
        List<DemoUser> seed;
        try
        {
            await using var stream = File.OpenRead(file);
            seed = await JsonSerializer.DeserializeAsync<List<DemoUser>>(stream, JsonSerializerOptions.Web, cancellationToken) ?? [];
        }
        catch (Exception ex) when (ex is IOException or JsonException or UnauthorizedAccessException)
        {
            throw new InvalidOperationException($"Access:DemoUsersPath '{file}' could not be read: {ex.Message}", ex);
        }
        var lines = new List<string>();
        foreach (var entry in seed)
        {
            if (!AllRoles.Contains(entry.Role))
            {
                throw new InvalidOperationException($"Access:DemoUsersPath '{file}': user '{entry.Name}' has unknown role '{entry.Role}'.");
            }
            var password = NewPassword();
            var user = await users.FindByNameAsync(entry.Name);
            if (user is null)
            {
                user = new OpsLvpUser { UserName = entry.Name, DisplayName = entry.DisplayName, IsDemo = true, CreatedAt = clock.GetUtcNow() };
                Check(await users.CreateAsync(user, password), $"create demo user {entry.Name}");
            }
            else
            {
                user.Disabled = false;
                user.DisplayName = entry.DisplayName;
                Check(await users.UpdateAsync(user), $"update demo user {entry.Name}");
                Check(await users.RemovePasswordAsync(user), $"reset demo user {entry.Name}");
                Check(await users.AddPasswordAsync(user, password), $"reset demo user {entry.Name}");
                Check(await users.SetLockoutEndDateAsync(user, null), $"unlock demo user {entry.Name}");
            }
            await UserAdmin.ApplyRolesAndTeamsAsync(users, user, [entry.Role], entry.Teams);
            demoAccounts.Set(entry.Name, password);
            lines.Add($"    {entry.Name,-14} {password}  {entry.Role}{(entry.Teams.Count > 0 ? " (" + string.Join(", ", entry.Teams) + ")" : "")}");
        }
        Console.Out.WriteLine("==== DEMO-ONLY sign-ins (invented people; new passwords at every start; never use in service) ====");
        foreach (var line in lines)
        {
            Console.Out.WriteLine(line);
        }
        Console.Out.WriteLine("==== end of DEMO-ONLY sign-ins ====");
    }

    private static async Task DisableDemoAccountsAsync(UserManager<OpsLvpUser> users, CancellationToken cancellationToken)
    {
        var leftOver = await users.Users.Where(u => u.IsDemo && !u.Disabled).ToListAsync(cancellationToken);
        foreach (var user in leftOver)
        {
            user.Disabled = true;
            Check(await users.UpdateAsync(user), $"disable demo user {user.UserName}");
            Check(await users.UpdateSecurityStampAsync(user), $"disable demo user {user.UserName}");
        }
    }

    private static void Check(IdentityResult result, string what)
    {
        if (!result.Succeeded)
        {
            throw new InvalidOperationException($"{what}: {string.Join("; ", result.Errors.Select(e => e.Description))}");
        }
    }
}
