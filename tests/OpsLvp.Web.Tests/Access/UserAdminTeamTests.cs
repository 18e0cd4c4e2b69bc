using System.Net;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// Issue 13 "Admin": teams are the running profile's teams (seed-demo/profile.json, invented aerodrome XDMO); an unknown
/// team is refused by the server with a reason tied to the teams field; the users page offers the profile's teams and
/// shows roles by their names. Real app on 127.0.0.1 with a temporary SQLite file.
/// </summary>
public sealed class UserAdminTeamTests
{
    [Fact]
    public async Task GroundStaff_InATeamTheProfileDoesNotHave_IsRefused_BesideTheTeamsField_AndNotCreated()
    {
        await using var app = AccessApp.Start();

        var result = await app.WithAdminAsync(a => a.CreateAsync("test-admin", "k.typo", "K Typo (invented)", AccessApp.Password, [Roles.GroundStaff], ["airside-opz"]));

        Assert.False(result.Succeeded);
        Assert.StartsWith("team 'airside-opz' is not a team of the aerodrome profile (its teams: Airside operations desk (airside-ops)", result.FieldErrors[UserAdminFields.Teams], StringComparison.Ordinal);
        Assert.DoesNotContain(await app.WithAdminAsync(a => a.ListAsync()), u => u.UserName == "k.typo");
    }

    [Fact]
    public async Task ChangingTeams_ToOneTheProfileDoesNotHave_IsRefused_AndTheOldTeamsStay()
    {
        await using var app = AccessApp.Start();
        var id = await app.CreateUserAsync("k.team", Roles.GroundStaff, "airside-ops");

        var result = await app.WithAdminAsync(a => a.SetRolesAsync("test-admin", id, [Roles.GroundStaff], ["no-such-team"]));

        Assert.False(result.Succeeded);
        Assert.Contains("no-such-team", result.FieldErrors[UserAdminFields.Teams], StringComparison.Ordinal);
        Assert.Equal(["airside-ops"], (await app.WithAdminAsync(a => a.ListAsync())).Single(u => u.UserName == "k.team").Teams);
    }

    [Fact]
    public async Task RoleAndPasswordRefusals_NameTheirFields()
    {
        await using var app = AccessApp.Start();

        var result = await app.WithAdminAsync(a => a.CreateAsync("test-admin", "k.none", "K None (invented)", "short", [], []));

        Assert.False(result.Succeeded);
        Assert.Equal("choose at least one role", result.FieldErrors[UserAdminFields.Roles]);
        Assert.True(result.FieldErrors.ContainsKey(UserAdminFields.Password));
        Assert.False(result.FieldErrors.ContainsKey(UserAdminFields.Teams));
    }

    [Fact]
    public async Task UsersPage_OffersTheProfilesTeams_AndNamesTheRoles()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("admin.teams", Roles.Administrator);
        using var admin = AccessClient.For(app);
        using (var signIn = await admin.SignInAsync("admin.teams", AccessApp.Password))
        {
            Assert.Equal(HttpStatusCode.Redirect, signIn.StatusCode);
        }

        using var page = await admin.GetAsync("/admin/users");
        var html = await page.Content.ReadAsStringAsync();

        Assert.Equal(HttpStatusCode.OK, page.StatusCode);
        Assert.Contains("data-testid=\"team-airside-ops\"", html, StringComparison.Ordinal);
        Assert.Contains("Airside operations desk", html, StringComparison.Ordinal);
        Assert.Contains("Duty manager", html, StringComparison.Ordinal);
        Assert.DoesNotContain("comma-separated", html, StringComparison.Ordinal);
    }
}
