using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;
using System.Threading.Channels;
using Microsoft.AspNetCore.Http.Connections;
using Microsoft.AspNetCore.SignalR.Client;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Web.Access;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Access;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Infrastructure.Services;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Deployment;

/// <summary>
/// Two app nodes behind a real nginx running the repository's configuration for docker-compose's profile <c>ha</c>
/// (docs/deployment.md): sticky sessions by nginx's cookie, WebSockets through it, pages and /health, and the client's
/// address reaching the node through X-Forwarded-For. Readings and addresses invented (RFC 5737 ranges).
/// </summary>
public sealed partial class NginxProxyTests(TwoNodesBehindNginx cluster) : IClassFixture<TwoNodesBehindNginx>
{
    private static readonly TimeSpan Patience = TimeSpan.FromSeconds(60);

    private HttpClient Client(string id, CookieContainer? jar = null, IPAddress? localAddress = null)
    {
        var handler = new SocketsHttpHandler { CookieContainer = jar ?? new CookieContainer(), UseCookies = true, AllowAutoRedirect = false };
        if (localAddress is not null)
        {
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
        var client = new HttpClient(handler) { BaseAddress = cluster.Nginx.BaseAddress, Timeout = TimeSpan.FromSeconds(30) };
        client.DefaultRequestHeaders.Add(NginxProcess.ClientHeader, id);
        return client;
    }

    private List<string> UpstreamsOf(string client) =>
        cluster.Nginx.AccessLog().Where(l => l.Client == client).Select(l => l.Upstream).Distinct().ToList();

    private static string NodeCookie(CookieContainer jar, Uri address) =>
        Assert.Single(jar.GetCookies(address), c => c.Name == "opslvp_node").Value;

    [NginxFact]
    public async Task EachClient_StaysOnOneNode_AndTheClientsSpreadOverBothNodes()
    {
        var run = Guid.NewGuid().ToString("N")[..8];
        for (var c = 0; c < 24; c++)
        {
            var jar = new CookieContainer();
            using var client = Client($"{run}-{c}", jar);
            for (var r = 0; r < 4; r++)
            {
                using var response = await client.GetAsync(new Uri("/health", UriKind.Relative));
                Assert.Equal(HttpStatusCode.OK, response.StatusCode);
                // nginx sets its cookie on the first response only
                Assert.Equal(r == 0, response.Headers.TryGetValues("Set-Cookie", out var set) && set.Any(s => s.StartsWith("opslvp_node=", StringComparison.Ordinal)));
            }
            Assert.Matches("^[0-9a-f]{32}$", NodeCookie(jar, cluster.Nginx.BaseAddress));
        }

        var perClient = Enumerable.Range(0, 24).Select(c => UpstreamsOf($"{run}-{c}")).ToList();
        Assert.All(perClient, upstreams => Assert.Single(upstreams));
        var nodes = cluster.Nodes.Select(n => $"{n.BaseAddress.Host}:{n.BaseAddress.Port}").Order(StringComparer.Ordinal);
        Assert.Equal(nodes, perClient.Select(u => u[0]).Distinct().Order(StringComparer.Ordinal));
    }

    [NginxFact]
    public async Task TheNodeCookie_DecidesTheNode()
    {
        var run = Guid.NewGuid().ToString("N")[..8];
        for (var pair = 0; pair < 8; pair++)
        {
            var first = new CookieContainer();
            using (var client = Client($"{run}-a{pair}", first))
            {
                (await client.GetAsync(new Uri("/health", UriKind.Relative))).Dispose();
            }
            // Another browser that presents the same cookie (a restored tab) lands on the same node.
            var second = new CookieContainer();
            second.Add(cluster.Nginx.BaseAddress, new Cookie("opslvp_node", NodeCookie(first, cluster.Nginx.BaseAddress)));
            using (var client = Client($"{run}-b{pair}", second))
            {
                (await client.GetAsync(new Uri("/health", UriKind.Relative))).Dispose();
            }
            Assert.Equal(Assert.Single(UpstreamsOf($"{run}-a{pair}")), Assert.Single(UpstreamsOf($"{run}-b{pair}")));
        }
    }

    [NginxFact]
    public async Task HealthAndTheSignInPage_AreServedThroughNginx()
    {
        using var client = Client("pages");

        var health = await client.GetFromJsonAsync<JsonElement>(new Uri("/health", UriKind.Relative));
        Assert.Equal("ok", health.GetProperty("status").GetString());
        using var page = await client.GetAsync(new Uri("/signin", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, page.StatusCode);
        Assert.Equal("text/html", page.Content.Headers.ContentType?.MediaType);
        Assert.Contains("__RequestVerificationToken", await page.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.Single(UpstreamsOf("pages"));
    }

    [NginxFact]
    public async Task AHubClient_ConnectsThroughNginxWithWebSockets_AndReceivesLiveState()
    {
        var jar = new CookieContainer();
        using var http = Client("hub", jar);
        (await http.GetAsync(new Uri("/health", UriKind.Relative))).Dispose();
        var node = cluster.NodeAt(Assert.Single(UpstreamsOf("hub")));
        var readerKey = await LiveClient.ReaderKeyAsync(node);

        var states = Channel.CreateUnbounded<JsonElement>();
        // WebSockets only, after negotiate: both must reach the node that knows the connection.
        await using var hub = new HubConnectionBuilder()
            .WithUrl(new Uri(cluster.Nginx.BaseAddress, "/hubs/lvp"), HttpTransportType.WebSockets, o =>
            {
                o.Cookies = jar;
                o.Headers[ApiKeyAuthenticationHandler.Header] = readerKey;
                o.Headers[NginxProcess.ClientHeader] = "hub";
            })
            .Build();
        hub.On<JsonElement>("state", s => states.Writer.TryWrite(s));
        await hub.StartAsync();
        Assert.Equal("normal", LiveClient.Phase(await NextAsync(states, _ => true)));

        // 900 m < the test profile's preparation threshold of 1000 m, pushed through nginx too.
        using var push = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900) + "] }", Encoding.UTF8, "application/json"),
        };
        push.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using (var accepted = await http.SendAsync(push))
        {
            Assert.Equal(HttpStatusCode.Accepted, accepted.StatusCode);
        }
        var live = await NextAsync(states, s => LiveClient.Phase(s) == "preparation");
        Assert.Equal(900, live.GetProperty("status").GetProperty("governingRvr").GetProperty("value").GetDouble());

        var log = cluster.Nginx.AccessLog().Where(l => l.Client == "hub").ToList();
        Assert.Contains(log, l => l.Request.StartsWith("POST /hubs/lvp/negotiate", StringComparison.Ordinal) && l.Status == 200);
        Assert.Single(UpstreamsOf("hub"));
        // The WebSocket's line is written when it closes.
        await hub.StopAsync();
        await Eventually.TrueAsync(() => cluster.Nginx.AccessLog().Any(l => l.Client == "hub" && l.Status == 101 && l.Request.StartsWith("GET /hubs/lvp?id=", StringComparison.Ordinal)),
            "the WebSocket upgrade (101) in nginx's access log", Patience);
        Assert.Single(UpstreamsOf("hub"));
    }

    [NginxFact]
    public async Task TheClientAddress_ReachesTheNode_ThroughXForwardedFor_AndCannotBeSpoofed()
    {
        // 127.0.0.2 is loopback on Linux: the client's address differs from nginx's own (127.0.0.1).
        using var client = Client("address", localAddress: IPAddress.Parse("127.0.0.2"));
        client.DefaultRequestHeaders.Add("X-Forwarded-For", "203.0.113.9");
        var html = await client.GetStringAsync(new Uri("/signin", UriKind.Relative));
        var token = WebUtility.HtmlDecode(TokenPattern().Match(html).Groups[1].Value);
        using var form = new FormUrlEncodedContent(new Dictionary<string, string>
        {
            ["_handler"] = "signin",
            ["__RequestVerificationToken"] = token,
            ["Input.UserName"] = "nobody.behind.nginx",
            ["Input.Password"] = "not-the-password-00",
        });
        using var response = await client.PostAsync(new Uri("/signin", UriKind.Relative), form);
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);

        var node = cluster.NodeAt(Assert.Single(UpstreamsOf("address")));
        await node.Services.GetRequiredService<SignInFailureAudit>().FlushAsync(all: true);
        var failed = (await node.AuditAsync()).Where(e => e.Kind == AccessAuditKinds.SignInFailed)
            .Select(e => JsonDocument.Parse(e.PayloadJson).RootElement)
            .Single(p => p.GetProperty("userName").GetString() == "nobody.behind.nginx");
        Assert.Equal("127.0.0.2", failed.GetProperty("address").GetString());
    }

    private static Task<JsonElement> NextAsync(Channel<JsonElement> states, Func<JsonElement, bool> match) =>
        StateChannels.NextAsync(states, match, Patience);

    [GeneratedRegex("name=\"__RequestVerificationToken\"[^>]*value=\"([^\"]+)\"")]
    private static partial Regex TokenPattern();
}
