using System.Net;
using System.Text.RegularExpressions;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Access;

/// <summary>A browser-like HTTP client for one person: its own cookies, no automatic redirects, real static SSR forms.</summary>
public sealed partial class AccessClient : IDisposable
{
    private AccessClient(OpsLvpApp app, IPAddress? localAddress)
    {
        Cookies = new CookieContainer();
        var handler = new SocketsHttpHandler { CookieContainer = Cookies, UseCookies = true, AllowAutoRedirect = false };
        if (localAddress is not null)
        {
            // Another client address on the loopback network, for per-address rules.
            handler.ConnectCallback = async (context, cancellationToken) =>
            {
                var socket = new System.Net.Sockets.Socket(System.Net.Sockets.SocketType.Stream, System.Net.Sockets.ProtocolType.Tcp);
                try
                {
                    socket.Bind(new IPEndPoint(localAddress, 0));
                    await socket.ConnectAsync(context.DnsEndPoint, cancellationToken);
                    return new System.Net.Sockets.NetworkStream(socket, ownsSocket: true);
                }
                catch
                {
                    socket.Dispose();
                    throw;
                }
            };
        }
        Http = new HttpClient(handler)
        {
            BaseAddress = app.BaseAddress,
            Timeout = TimeSpan.FromSeconds(20),
        };
    }

    public CookieContainer Cookies { get; }

    public HttpClient Http { get; }

    public static AccessClient For(OpsLvpApp app, IPAddress? localAddress = null) => new(app, localAddress);

    /// <summary>Posts the sign-in form as a browser would (antiforgery token from the page); returns the response.</summary>
    public async Task<HttpResponseMessage> SignInAsync(string userName, string password, string returnUrl = "/")
    {
        var path = "/signin?returnUrl=" + Uri.EscapeDataString(returnUrl);
        var token = await FormTokenAsync(path);
        using var form = new FormUrlEncodedContent(new Dictionary<string, string>
        {
            ["_handler"] = "signin",
            ["__RequestVerificationToken"] = token,
            ["Input.UserName"] = userName,
            ["Input.Password"] = password,
        });
        return await Http.PostAsync(new Uri(path, UriKind.Relative), form);
    }

    /// <summary>Posts the setup form.</summary>
    public async Task<string> SetupAsync(string secret, string userName, string password)
    {
        var token = await FormTokenAsync("/setup");
        using var form = new FormUrlEncodedContent(new Dictionary<string, string>
        {
            ["_handler"] = "setup",
            ["__RequestVerificationToken"] = token,
            ["Input.Secret"] = secret,
            ["Input.UserName"] = userName,
            ["Input.DisplayName"] = "Test Administrator (invented)",
            ["Input.Password"] = password,
            ["Input.Confirm"] = password,
        });
        using var response = await Http.PostAsync(new Uri("/setup", UriKind.Relative), form);
        return WebUtility.HtmlDecode(await response.Content.ReadAsStringAsync());
    }

    public async Task<HttpResponseMessage> SignOutAsync()
    {
        var token = await FormTokenAsync("/signout");
        using var form = new FormUrlEncodedContent(new Dictionary<string, string>
        {
            ["_handler"] = "signout",
            ["__RequestVerificationToken"] = token,
        });
        return await Http.PostAsync(new Uri("/signout", UriKind.Relative), form);
    }

    public async Task<HttpResponseMessage> GetAsync(string path) => await Http.GetAsync(new Uri(path, UriKind.Relative));

    public bool HasCookie(string name) => Cookies.GetAllCookies().Any(c => c.Name == name && !c.Expired);

    public void Dispose() => Http.Dispose();

    private async Task<string> FormTokenAsync(string path)
    {
        var html = await Http.GetStringAsync(new Uri(path, UriKind.Relative));
        var match = TokenPattern().Match(html);
        Assert.True(match.Success, $"{path} has no antiforgery token");
        return WebUtility.HtmlDecode(match.Groups[1].Value);
    }

    [GeneratedRegex("name=\"__RequestVerificationToken\"[^>]*value=\"([^\"]+)\"")]
    private static partial Regex TokenPattern();
}
