using System.Net;
using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using OpsLvp.Web.Access;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// X-Forwarded-For and X-Forwarded-Proto are believed only from the proxies <c>Network:TrustedProxies</c> names
/// (docs/deployment.md "Behind a reverse proxy"); by default nobody is trusted, so a client cannot choose the address its
/// sign-in attempts are counted and audited under. Client addresses are from the documentation ranges of RFC 5737.
/// </summary>
public sealed class ForwardedHeadersTests
{
    private const string ClientA = "203.0.113.7";

    private const string ClientB = "203.0.113.8";

    private static OpsLvpApp Start(string? trusted)
    {
        var settings = new Dictionary<string, string?> { ["Access:SignInPerAddressPerMinute"] = "2" };
        if (trusted is not null)
        {
            settings["Network:TrustedProxies:0"] = trusted;
        }
        return AccessApp.Start(settings);
    }

    private static async Task<HttpStatusCode> SignInFromAsync(AccessClient client, string forwardedFor)
    {
        client.Http.DefaultRequestHeaders.Remove("X-Forwarded-For");
        client.Http.DefaultRequestHeaders.Add("X-Forwarded-For", forwardedFor);
        using var response = await client.SignInAsync("nobody.here", "not-the-password-00");
        return response.StatusCode;
    }

    private static async Task<List<string?>> FailedSignInAddressesAsync(OpsLvpApp app)
    {
        await app.Services.GetRequiredService<SignInFailureAudit>().FlushAsync(all: true);
        return (await app.AuditAsync()).Where(e => e.Kind == AccessAuditKinds.SignInFailed)
            .Select(e => JsonDocument.Parse(e.PayloadJson).RootElement.GetProperty("address").GetString()).ToList();
    }

    [Fact]
    public async Task WithTheProxyTrusted_TheForwardedAddress_IsThrottledAndAudited()
    {
        // The test client connects from 127.0.0.1: it plays the proxy.
        await using var app = Start("127.0.0.1");
        using var client = AccessClient.For(app);

        Assert.Equal(HttpStatusCode.OK, await SignInFromAsync(client, ClientA));
        Assert.Equal(HttpStatusCode.OK, await SignInFromAsync(client, ClientA));
        Assert.Equal(HttpStatusCode.TooManyRequests, await SignInFromAsync(client, ClientA));
        // Another client behind the same proxy has its own count.
        Assert.Equal(HttpStatusCode.OK, await SignInFromAsync(client, ClientB));

        Assert.Equal([ClientA, ClientA, ClientB], await FailedSignInAddressesAsync(app));
    }

    [Fact]
    public async Task ByDefault_NoProxyIsTrusted_AndXForwardedForIsIgnored()
    {
        await using var app = Start(trusted: null);
        using var client = AccessClient.For(app);

        Assert.Equal(HttpStatusCode.OK, await SignInFromAsync(client, ClientA));
        Assert.Equal(HttpStatusCode.OK, await SignInFromAsync(client, ClientB));
        // A third address in the header changes nothing: the connection's address has used its two attempts.
        Assert.Equal(HttpStatusCode.TooManyRequests, await SignInFromAsync(client, "198.51.100.9"));

        Assert.Equal(["127.0.0.1", "127.0.0.1"], await FailedSignInAddressesAsync(app));
    }

    [Fact]
    public async Task AProxyNotListed_IsNotBelieved_EvenOnLoopback()
    {
        // ASP.NET Core's own default would trust loopback; only the listed network is trusted here.
        await using var app = Start("10.9.8.0/24");
        using var client = AccessClient.For(app);

        Assert.Equal(HttpStatusCode.OK, await SignInFromAsync(client, ClientA));

        Assert.Equal(["127.0.0.1"], await FailedSignInAddressesAsync(app));
    }

    [Theory]
    [InlineData("127.0.0.1", true)]
    [InlineData("127.0.0.0/8", true)]
    [InlineData(null, false)]
    public async Task ForwardedHttps_MakesTheCookiesSecure_OnlyFromATrustedProxy(string? trusted, bool secure)
    {
        await using var app = Start(trusted);
        using var http = new HttpClient(new SocketsHttpHandler { UseCookies = false, AllowAutoRedirect = false }) { BaseAddress = app.BaseAddress };
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/signin", UriKind.Relative));
        request.Headers.Add("X-Forwarded-Proto", "https");

        using var response = await http.SendAsync(request);

        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        var antiforgery = Assert.Single(response.Headers.GetValues("Set-Cookie"), c => c.StartsWith(".OpsLvp.Antiforgery=", StringComparison.Ordinal));
        Assert.Equal(secure, antiforgery.Contains("; secure", StringComparison.OrdinalIgnoreCase));
    }

    [Theory]
    [InlineData("proxy.local")]
    [InlineData("10")]
    [InlineData("10.0.0.0/40")]
    public void ABadTrustedProxy_StopsTheStart_NamingTheSetting(string bad)
    {
        var ex = Assert.ThrowsAny<Exception>(() => OpsLvpApp.Start(new Dictionary<string, string?> { ["Network:TrustedProxies:0"] = bad }));
        var validation = ex as OptionsValidationException ?? ex.InnerException as OptionsValidationException
            ?? (ex as AggregateException)?.InnerExceptions.OfType<OptionsValidationException>().FirstOrDefault();
        Assert.NotNull(validation);
        Assert.Contains($"Network:TrustedProxies:0 must be an IP address or a network in CIDR form (e.g. 10.0.0.0/24), not '{bad}'.", validation.Message, StringComparison.Ordinal);
    }
}
