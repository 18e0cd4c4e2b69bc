using System.Net;
using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// The data-protection key ring is kept in the database, so a container re-created on the same data folder keeps its
/// sessions and forms (it used to sit in the user profile, which a new container does not have).
/// </summary>
public sealed class DataProtectionKeyTests
{
    [Fact]
    public async Task KeyRing_IsInTheDatabase_AndASessionSurvivesARestartOnTheSameDataFolder()
    {
        var folder = OpsLvpApp.NewDataFolder();
        var settings = new Dictionary<string, string?>
        {
            ["Access:SetupSecret"] = AccessApp.SetupSecret,
            ["Access:SignInPerAddressPerMinute"] = "1000",
            ["Access:SignInAttemptsPerAccount"] = "1000",
            ["Access:SignInAttemptsPerAccountAllAddresses"] = "1000",
        };
        try
        {
            Cookie session;
            await using (var first = OpsLvpApp.Start(settings, folder))
            {
                await first.CreateUserAsync("v.keys", Roles.Viewer);
                using var person = AccessClient.For(first);
                (await person.SignInAsync("v.keys", AccessApp.Password)).Dispose();
                session = person.Cookies.GetAllCookies().Single(c => c.Name == Web.Access.AccessSchemes.SessionCookieName);

                var factory = first.Services.GetRequiredService<IDbContextFactory<OpsLvpDbContext>>();
                await using var db = await factory.CreateDbContextAsync();
                var keys = await db.DataProtectionKeys.AsNoTracking().ToListAsync();
                Assert.NotEmpty(keys);
                Assert.All(keys, k => Assert.Contains("<key ", k.Xml, StringComparison.Ordinal));
            }

            await using var second = OpsLvpApp.Start(settings, folder);
            using var copy = new HttpClient(new HttpClientHandler { UseCookies = false, AllowAutoRedirect = false }) { BaseAddress = second.BaseAddress };
            copy.DefaultRequestHeaders.Add("Cookie", $"{session.Name}={session.Value}");
            using var response = await copy.GetAsync(new Uri("/api/state", UriKind.Relative));

            Assert.NotEqual(HttpStatusCode.Unauthorized, response.StatusCode);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }
}
