using System.Net;
using Microsoft.AspNetCore.Authorization;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Access;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// Every endpoint the app maps has a decided access rule, and the rule holds over HTTP for each role, anonymous and a
/// disabled user. A new endpoint without an entry in <see cref="Expected"/> fails <see cref="EveryEndpoint_HasADecidedAccessRule"/>.
/// </summary>
public sealed class EndpointAccessTests
{
    /// <summary>Anyone may call it (the handler may still check a token or key itself).</summary>
    private const string Public = "public";

    /// <summary>Blazor's own circuit endpoints: the circuit's principal is revalidated (see LiveRevocationTests).</summary>
    private const string Framework = "framework";

    /// <summary>The handler authenticates the API key and needs the ingest scope (see ApiKeyTests).</summary>
    private const string IngestInHandler = "ingest-in-handler";

    private static readonly Dictionary<string, string> Expected = new(StringComparer.Ordinal)
    {
        ["/"] = Public,
        ["/signin"] = Public,
        ["/signout"] = Public,
        ["/setup"] = Public,
        ["/access-denied"] = Public,
        ["/Error"] = Public,
        ["/not-found"] = Public,
        ["/health"] = Public,
        ["/health/ready"] = Public, // the same body as /health, 503 while failing: for a load balancer, which signs in as no one
        ["/display/{token}"] = Public,
        ["/api/readings"] = IngestInHandler,
        ["/api/forecasts"] = IngestInHandler,
        ["/api/facilities"] = IngestInHandler,
        ["/admin/users"] = AccessPolicies.Admin,
        ["/admin/displays"] = AccessPolicies.Admin,
        ["/admin/keys"] = AccessPolicies.Admin,
        ["/api/admin/anchor"] = AccessPolicies.Admin,
        ["/console"] = AccessPolicies.Console,
        ["/actions"] = AccessPolicies.Actions,
        ["/wall"] = AccessPolicies.Wall,
        ["/hubs/lvp"] = AccessPolicies.HubRead,
        ["/hubs/lvp/negotiate"] = AccessPolicies.HubRead,
        ["/api/state"] = AccessPolicies.HubRead,
        ["/review"] = AccessPolicies.Review,
        ["/review/{EpisodeId}"] = AccessPolicies.Review,
        ["/api/episodes/"] = AccessPolicies.Review,
        ["/api/episodes/{id}/readings.csv"] = AccessPolicies.Review,
        ["/api/episodes/{id}/audit.csv"] = AccessPolicies.Review,
        ["/api/episodes/{id}/capability.csv"] = AccessPolicies.Review,
        ["/api/episodes/{id}/export.json"] = AccessPolicies.Review,
        ["/_blazor"] = Framework,
        ["/_blazor/negotiate"] = Framework,
        ["/_blazor/initializers/"] = Framework,
        ["/_blazor/disconnect/"] = Framework,
        ["/{**path:file}"] = Framework,
    };

    [Fact]
    public async Task EveryEndpoint_HasADecidedAccessRule()
    {
        await using var app = AccessApp.Start();
        var problems = new List<string>();

        foreach (var (pattern, actual) in MappedEndpoints(app))
        {
            if (!Expected.TryGetValue(pattern, out var expected))
            {
                problems.Add($"{pattern}: no access rule decided (add it to the table and protect it), has '{actual}'");
            }
            else if (expected != Framework && expected != actual && !(expected is IngestInHandler && actual == Public))
            {
                problems.Add($"{pattern}: expected '{expected}', has '{actual}'");
            }
        }

        Assert.True(problems.Count == 0, string.Join("\n", problems));
    }

    public static TheoryData<string, string?, HttpStatusCode, string?> PageMatrix()
    {
        var data = new TheoryData<string, string?, HttpStatusCode, string?>();
        foreach (var page in new[] { "/admin/users", "/admin/displays", "/admin/keys" })
        {
            data.Add(page, Roles.Administrator, HttpStatusCode.OK, null);
            data.Add(page, Roles.DutyManager, HttpStatusCode.Redirect, "/access-denied");
            data.Add(page, Roles.GroundStaff, HttpStatusCode.Redirect, "/access-denied");
            data.Add(page, Roles.Viewer, HttpStatusCode.Redirect, "/access-denied");
            data.Add(page, null, HttpStatusCode.Redirect, "/signin");
        }
        // Role → page, as docs/access.md decides it: the wall and review for any role, the console for the duty
        // manager, the tablets for ground staff and the duty manager.
        var allowed = new Dictionary<string, string[]>
        {
            ["/wall"] = [Roles.Administrator, Roles.DutyManager, Roles.GroundStaff, Roles.Viewer],
            ["/review"] = [Roles.Administrator, Roles.DutyManager, Roles.GroundStaff, Roles.Viewer],
            ["/console"] = [Roles.DutyManager],
            ["/actions"] = [Roles.GroundStaff, Roles.DutyManager],
        };
        foreach (var (page, roles) in allowed)
        {
            foreach (var role in new[] { Roles.Administrator, Roles.DutyManager, Roles.GroundStaff, Roles.Viewer })
            {
                if (roles.Contains(role))
                {
                    data.Add(page, role, HttpStatusCode.OK, null);
                }
                else
                {
                    data.Add(page, role, HttpStatusCode.Redirect, "/access-denied");
                }
            }
            data.Add(page, null, HttpStatusCode.Redirect, "/signin");
        }
        foreach (var role in new[] { Roles.Administrator, Roles.DutyManager, Roles.GroundStaff, Roles.Viewer })
        {
            data.Add("/api/episodes", role, HttpStatusCode.OK, null);
        }
        data.Add("/api/episodes", null, HttpStatusCode.Unauthorized, null);
        foreach (var page in new[] { "/", "/signin", "/health" })
        {
            data.Add(page, null, HttpStatusCode.OK, null);
            data.Add(page, Roles.Viewer, HttpStatusCode.OK, null);
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(PageMatrix))]
    public async Task Page_AnswersEachRole_AsItsPolicySays(string path, string? role, HttpStatusCode status, string? redirectTo)
    {
        await using var app = AccessApp.Start();
        using var client = AccessClient.For(app);
        if (role is not null)
        {
            var teams = role == Roles.GroundStaff ? new[] { "airside-ops" } : [];
            await app.CreateUserAsync("someone", role, teams);
            using var _ = await client.SignInAsync("someone", AccessApp.Password);
        }

        using var response = await client.GetAsync(path);

        Assert.Equal(status, response.StatusCode);
        if (redirectTo is not null)
        {
            Assert.Equal(redirectTo, new Uri(app.BaseAddress, response.Headers.Location!).AbsolutePath);
        }
    }

    [Theory]
    [InlineData("/wall", HttpStatusCode.OK, null)]
    [InlineData("/review", HttpStatusCode.Redirect, "/access-denied")]
    [InlineData("/console", HttpStatusCode.Redirect, "/access-denied")]
    [InlineData("/actions", HttpStatusCode.Redirect, "/access-denied")]
    [InlineData("/admin/users", HttpStatusCode.Redirect, "/access-denied")]
    [InlineData("/api/episodes", HttpStatusCode.Forbidden, null)]
    public async Task DisplayLink_ReachesOnlyTheWall(string path, HttpStatusCode status, string? redirectTo)
    {
        await using var app = AccessApp.Start();
        var issued = await app.Services.GetRequiredService<CredentialAdmin>().IssueDisplayAsync("test-admin", "ops room centre (invented)");
        using var kiosk = AccessClient.For(app);
        using var opened = await kiosk.GetAsync("/display/" + issued.Secret);
        Assert.Equal(HttpStatusCode.Redirect, opened.StatusCode);

        using var response = await kiosk.GetAsync(path);

        Assert.Equal(status, response.StatusCode);
        if (redirectTo is not null)
        {
            Assert.Equal(redirectTo, new Uri(app.BaseAddress, response.Headers.Location!).AbsolutePath);
        }
    }

    [Fact]
    public async Task DisabledAdministrator_LosesTheAdminPages_AtTheNextRevalidation()
    {
        await using var app = AccessApp.Start();
        var id = await app.CreateUserAsync("admin.test", Roles.Administrator);
        await app.CreateUserAsync("other.admin", Roles.Administrator);
        using var client = AccessClient.For(app);
        using var _ = await client.SignInAsync("admin.test", AccessApp.Password);
        using var before = await client.GetAsync("/admin/users");
        Assert.Equal(HttpStatusCode.OK, before.StatusCode);

        await app.WithAdminAsync(a => a.SetDisabledAsync("other.admin", id, true));
        await Task.Delay(TimeSpan.FromSeconds(2.5)); // Access:RevalidationInterval is 2 s in AccessApp

        using var after = await client.GetAsync("/admin/users");
        Assert.Equal(HttpStatusCode.Redirect, after.StatusCode);
        Assert.Equal("/signin", new Uri(app.BaseAddress, after.Headers.Location!).AbsolutePath);
    }

    private static IEnumerable<(string Pattern, string Access)> MappedEndpoints(OpsLvpApp app)
    {
        var sources = app.Services.GetRequiredService<EndpointDataSource>();
        foreach (var endpoint in sources.Endpoints.OfType<RouteEndpoint>())
        {
            var pattern = "/" + (endpoint.RoutePattern.RawText ?? "").TrimStart('/');
            if (pattern.StartsWith("/_framework/", StringComparison.Ordinal) || pattern.StartsWith("/_content/", StringComparison.Ordinal)
                || pattern.Contains('.', StringComparison.Ordinal))
            {
                continue; // static files
            }
            yield return (pattern, AccessOf(endpoint));
        }
    }

    private static string AccessOf(Endpoint endpoint)
    {
        var authorize = endpoint.Metadata.GetOrderedMetadata<IAuthorizeData>();
        if (endpoint.Metadata.GetMetadata<IAllowAnonymous>() is not null || authorize.Count == 0)
        {
            return Public;
        }
        return string.Join(",", authorize.Select(a => a.Policy ?? "authenticated").Distinct());
    }
}
