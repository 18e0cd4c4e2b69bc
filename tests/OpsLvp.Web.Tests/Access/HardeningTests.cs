using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.SignalR;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using OpsLvp.Web.Access;

namespace OpsLvp.Web.Tests.Access;

/// <summary>Security headers, cookie flags and request limits as served.</summary>
public sealed class HardeningTests
{
    [Fact]
    public async Task Pages_CarryTheSecurityHeaders()
    {
        await using var app = AccessApp.Start();

        using var response = await app.Client.GetAsync(new Uri("/signin", UriKind.Relative));

        Assert.Equal(SecurityHeaders.ContentSecurityPolicy, response.Headers.GetValues("Content-Security-Policy").Single());
        Assert.Contains("frame-ancestors 'none'", SecurityHeaders.ContentSecurityPolicy, StringComparison.Ordinal);
        Assert.Contains("script-src 'self'", SecurityHeaders.ContentSecurityPolicy, StringComparison.Ordinal);
        Assert.Equal("nosniff", response.Headers.GetValues("X-Content-Type-Options").Single());
        Assert.Equal("DENY", response.Headers.GetValues("X-Frame-Options").Single());
        Assert.Equal("no-referrer", response.Headers.GetValues("Referrer-Policy").Single());
    }

    [Fact]
    public async Task AntiforgeryCookie_IsHttpOnlyAndStrict()
    {
        await using var app = AccessApp.Start();

        using var response = await app.Client.GetAsync(new Uri("/signin", UriKind.Relative));

        var cookie = response.Headers.GetValues("Set-Cookie").Single(c => c.StartsWith(".OpsLvp.Antiforgery=", StringComparison.Ordinal));
        Assert.Contains("httponly", cookie, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("samesite=strict", cookie, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public async Task SignInPost_WithoutAntiforgeryToken_IsRefused()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("r.test", Web.Commands.Roles.DutyManager);
        using var form = new FormUrlEncodedContent(new Dictionary<string, string>
        {
            ["_handler"] = "signin",
            ["Input.UserName"] = "r.test",
            ["Input.Password"] = AccessApp.Password,
        });

        using var response = await app.Client.PostAsync(new Uri("/signin", UriKind.Relative), form);

        Assert.Equal(System.Net.HttpStatusCode.BadRequest, response.StatusCode);
    }

    [Fact]
    public async Task HubMessages_AreLimitedTo32KiB()
    {
        await using var app = AccessApp.Start();

        var options = app.Services.GetRequiredService<IOptions<HubOptions>>().Value;

        Assert.Equal(32 * 1024, options.MaximumReceiveMessageSize);
    }

    [Fact]
    public async Task NoHttpsRedirection_UnlessConfigured()
    {
        await using var app = AccessApp.Start();

        using var response = await app.Client.GetAsync(new Uri("/", UriKind.Relative));

        Assert.Equal(System.Net.HttpStatusCode.OK, response.StatusCode);
        Assert.False(response.Headers.Contains("Strict-Transport-Security"));
    }

    [Theory]
    [InlineData("/assets/opslvp.css", System.Net.HttpStatusCode.OK)]
    [InlineData("/no-such-page", System.Net.HttpStatusCode.NotFound)]
    [InlineData("/assets/no-such-file.css", System.Net.HttpStatusCode.NotFound)]
    public async Task StaticAssetsAndErrorResponses_CarryTheSecurityHeadersToo(string path, System.Net.HttpStatusCode expected)
    {
        await using var app = AccessApp.Start();

        using var response = await app.Client.GetAsync(new Uri(path, UriKind.Relative));

        Assert.Equal(expected, response.StatusCode);
        Assert.Equal(SecurityHeaders.ContentSecurityPolicy, response.Headers.GetValues("Content-Security-Policy").Single());
        Assert.Equal("nosniff", response.Headers.GetValues("X-Content-Type-Options").Single());
        Assert.Equal("DENY", response.Headers.GetValues("X-Frame-Options").Single());
    }

    [Theory]
    [InlineData("/api/state")]
    [InlineData("/api/episodes")]
    [InlineData("/api/episodes/no-such-episode/export.json")]
    public async Task LiveAndReviewApis_AreNotStoredByCaches(string path)
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("c.test", Web.Commands.Roles.DutyManager);
        using var person = AccessClient.For(app);
        (await person.SignInAsync("c.test", AccessApp.Password)).Dispose();

        using var response = await person.GetAsync(path);

        Assert.NotEqual(System.Net.HttpStatusCode.Unauthorized, response.StatusCode);
        Assert.True(response.Headers.CacheControl?.NoStore, $"{path} answered {(int)response.StatusCode} without Cache-Control: no-store");
    }

    /// <remarks>
    /// The app has no request that fails on purpose, so the test adds one fault behind the whole production pipeline: a
    /// request that no endpoint takes reaches a middleware that throws, and the exception travels back up through the
    /// production exception handler (<c>UseExceptionHandler("/Error")</c>, active outside Development), which re-executes
    /// the error page with status 500. Headers and caching are checked on what the client receives.
    /// </remarks>
    [Fact]
    public async Task AnUnhandledException_Answers500_WithTheSecurityHeaders_AndNoStore()
    {
        await using var app = AccessApp.Start(services: s => s.AddTransient<IStartupFilter, ThrowBehindThePipeline>(), environment: "Production");

        using var response = await app.Client.GetAsync(new Uri(ThrowBehindThePipeline.Path, UriKind.Relative));
        var html = await response.Content.ReadAsStringAsync();

        Assert.Equal(System.Net.HttpStatusCode.InternalServerError, response.StatusCode);
        Assert.Contains("This page could not be shown", html, StringComparison.Ordinal);
        Assert.DoesNotContain("Development", html, StringComparison.Ordinal); // no advice to run a deployed server in Development mode
        Assert.DoesNotContain(ThrowBehindThePipeline.Message, html, StringComparison.Ordinal);
        Assert.Equal(SecurityHeaders.ContentSecurityPolicy, response.Headers.GetValues("Content-Security-Policy").Single());
        Assert.Equal("nosniff", response.Headers.GetValues("X-Content-Type-Options").Single());
        Assert.Equal("DENY", response.Headers.GetValues("X-Frame-Options").Single());
        Assert.Equal("no-referrer", response.Headers.GetValues("Referrer-Policy").Single());
        Assert.Equal("same-origin", response.Headers.GetValues("Cross-Origin-Opener-Policy").Single());
        Assert.True(response.Headers.Contains("Permissions-Policy"));
        Assert.True(response.Headers.CacheControl?.NoStore, $"the 500 answered Cache-Control: {response.Headers.CacheControl}");
    }

    /// <summary>Appends, after the app's own pipeline, a middleware that throws for <see cref="Path"/>.</summary>
    private sealed class ThrowBehindThePipeline : IStartupFilter
    {
        public const string Path = "/test-fault/throw";

        public const string Message = "invented fault for the 500 test";

        public Action<IApplicationBuilder> Configure(Action<IApplicationBuilder> next) => app =>
        {
            next(app);
            app.Use((HttpContext context, RequestDelegate rest) =>
                context.Request.Path == Path ? throw new InvalidOperationException(Message) : rest(context));
        };
    }
}
