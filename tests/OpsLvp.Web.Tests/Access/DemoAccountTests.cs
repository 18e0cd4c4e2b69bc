using System.Net;
using Microsoft.AspNetCore.Identity;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Entities;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Demo mode seeds the invented accounts of seed-demo/users.json with generated passwords; a real start does not.</summary>
public sealed class DemoAccountTests
{
    private const string TinyScenario = """
        # invented test scenario
        time,sensor,kind,value,status
        00:00:00,T1,rvr,1500,ok
        """;

    [Fact]
    public async Task DemoMode_SeedsUsersWithGeneratedPasswords_RolesAndTeams_AndClosesSetup()
    {
        var scenario = Path.Combine(Path.GetTempPath(), "opslvp-tests", Guid.NewGuid().ToString("N") + ".csv");
        Directory.CreateDirectory(Path.GetDirectoryName(scenario)!);
        await File.WriteAllTextAsync(scenario, TinyScenario);
        try
        {
            await using var app = AccessApp.Start(new Dictionary<string, string?>
            {
                ["Demo:Simulator"] = "On",
                ["Demo:ScenarioPath"] = scenario,
                ["Demo:ActionsPath"] = "",
            });
            var demo = app.Services.GetRequiredService<DemoAccounts>();

            Assert.Equal(9, demo.Passwords.Count); // seed-demo/users.json (invented people)
            Assert.All(demo.Passwords.Values, p => Assert.True(p.Length >= AccessServiceCollectionExtensions.MinPasswordLength));
            Assert.Equal(demo.Passwords.Count, demo.Passwords.Values.Distinct().Count());
            Assert.False(app.Services.GetRequiredService<SetupGate>().IsOpen);
            var marlow = await app.PrincipalOfAsync("k.marlow");
            Assert.True(marlow.IsInRole(Roles.GroundStaff));
            Assert.Equal(["airside-ops"], CommandCaller.FromPrincipal(marlow).Teams);
            using var client = AccessClient.For(app);
            using var response = await client.SignInAsync("k.marlow", demo.Passwords["k.marlow"]);
            Assert.Equal(HttpStatusCode.Redirect, response.StatusCode);
        }
        finally
        {
            File.Delete(scenario);
        }
    }

    [Fact]
    public async Task RealStart_SeedsNoAccounts_AndOpensSetup()
    {
        await using var app = AccessApp.Start();

        Assert.Empty(app.Services.GetRequiredService<DemoAccounts>().Passwords);
        Assert.True(app.Services.GetRequiredService<SetupGate>().IsOpen);
        using var scope = app.Services.CreateScope();
        Assert.Empty(scope.ServiceProvider.GetRequiredService<UserManager<OpsLvpUser>>().Users);
    }
}
