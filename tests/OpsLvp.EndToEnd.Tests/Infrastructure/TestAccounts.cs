using System.Security.Claims;
using Microsoft.AspNetCore.Identity;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// Accounts and display links in a test server's SQLite file, made with the app's own Identity services
/// (UserManager over <see cref="OpsLvpDbContext"/>, as src/OpsLvp.Web/Access registers them). People, names and
/// passwords are invented.
/// </summary>
public sealed class TestAccounts : IAsyncDisposable
{
    /// <summary>Invented password shared by every seeded account (meets the 12-character rule of docs/access.md).</summary>
    public const string Password = "invented-e2e-password-01";

    public const string Admin = "e2e.admin";
    public const string Manager = "e2e.manager";
    public const string Apron = "e2e.apron";
    public const string Lights = "e2e.lights";
    public const string Viewer = "e2e.viewer";
    public const string Lockout = "e2e.lockout";

    private readonly ServiceProvider _services;

    private TestAccounts(ServiceProvider services) => _services = services;

    // Pooling off: the test holds no connection once a call is done, so the server and the clean-up see the file free.
    public static TestAccounts Open(string dataFolder) =>
        Open(new ConfigurationBuilder().Build(), $"Data Source={Path.Combine(dataFolder, "opslvp.db")};Pooling=False");

    /// <summary>The accounts and display links of a PostgreSQL database (<paramref name="connectionString"/>), as the nodes of a cluster share it.</summary>
    public static TestAccounts OpenPostgres(string connectionString) =>
        Open(new ConfigurationBuilder().AddInMemoryCollection(new Dictionary<string, string?>
        {
            [OpsLvpDatabase.ProviderSetting] = OpsLvpDatabase.PostgresProvider,
            [OpsLvpDatabase.PostgresConnectionStringSetting] = new Npgsql.NpgsqlConnectionStringBuilder(connectionString) { Pooling = false }.ConnectionString,
        }).Build(), null);

    private static TestAccounts Open(IConfiguration configuration, string? defaultConnectionString)
    {
        var services = new ServiceCollection();
        services.AddLogging();
        services.AddOpsLvpData(configuration, defaultConnectionString);
        services.AddIdentityCore<OpsLvpUser>(o =>
            {
                // As AddAccess: length over composition (docs/access.md).
                o.Password.RequiredLength = AccessServiceCollectionExtensions.MinPasswordLength;
                o.Password.RequireDigit = false;
                o.Password.RequireLowercase = false;
                o.Password.RequireUppercase = false;
                o.Password.RequireNonAlphanumeric = false;
                o.Password.RequiredUniqueChars = 4;
                o.Lockout.AllowedForNewUsers = true;
                o.Lockout.MaxFailedAccessAttempts = AccessServiceCollectionExtensions.MaxFailedSignIns;
            })
            .AddRoles<IdentityRole>()
            .AddEntityFrameworkStores<OpsLvpDbContext>();
        return new TestAccounts(services.BuildServiceProvider());
    }

    /// <summary>Migrates the database, makes the four roles and the standard invented accounts (before the server starts).</summary>
    public async Task SeedStandardAsync()
    {
        await DatabaseStartup.MigrateAndCheckAsync(_services.GetRequiredService<Microsoft.EntityFrameworkCore.IDbContextFactory<OpsLvpDbContext>>());
        using (var scope = _services.CreateScope())
        {
            var roles = scope.ServiceProvider.GetRequiredService<RoleManager<IdentityRole>>();
            foreach (var role in AccessStartup.AllRoles)
            {
                if (!await roles.RoleExistsAsync(role))
                {
                    Check(await roles.CreateAsync(new IdentityRole(role)), "create role " + role);
                }
            }
        }
        await CreateUserAsync(Admin, Roles.Administrator);
        await CreateUserAsync(Manager, Roles.DutyManager);
        await CreateUserAsync(Apron, Roles.GroundStaff, TestProfile.ApronTeam);
        await CreateUserAsync(Lights, Roles.GroundStaff, TestProfile.LightsTeam);
        await CreateUserAsync(Viewer, Roles.Viewer);
        await CreateUserAsync(Lockout, Roles.Viewer);
    }

    public async Task CreateUserAsync(string userName, string role, params string[] teams)
    {
        using var scope = _services.CreateScope();
        var users = scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>();
        var user = new OpsLvpUser { UserName = userName, DisplayName = userName + " (invented)", CreatedAt = DateTimeOffset.UtcNow };
        Check(await users.CreateAsync(user, Password), "create " + userName);
        Check(await users.AddToRoleAsync(user, role), $"give {userName} the role {role}");
        foreach (var team in teams)
        {
            Check(await users.AddClaimAsync(user, new Claim(CommandCaller.TeamClaimType, team)), $"put {userName} in team {team}");
        }
    }

    /// <summary>Issues a display link with the app's own store; returns its path, <c>/display/&lt;token&gt;</c>.</summary>
    public async Task<string> IssueDisplayLinkAsync(string name)
    {
        var issued = await _services.GetRequiredService<DisplayTokenStore>().IssueAsync(name, Admin, DateTimeOffset.UtcNow);
        return "/display/" + issued.Secret;
    }

    public ValueTask DisposeAsync() => _services.DisposeAsync();

    private static void Check(IdentityResult result, string what)
    {
        if (!result.Succeeded)
        {
            throw new InvalidOperationException($"{what}: {string.Join("; ", result.Errors.Select(e => e.Description))}");
        }
    }
}
