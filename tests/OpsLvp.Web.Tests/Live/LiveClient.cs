using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>Helpers for live tests: push readings, read /api/state, verify the audit chain.</summary>
public static class LiveClient
{
    public static string Time(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", CultureInfo.InvariantCulture);

    public static string Item(DateTimeOffset t, string sensor, string kind, double value, string status = "ok") =>
        string.Create(CultureInfo.InvariantCulture, $$"""{ "time": "{{Time(t)}}", "sensor": "{{sensor}}", "kind": "{{kind}}", "value": {{value}}, "status": "{{status}}" }""");

    public static async Task PushAsync(OpsLvpApp app, params string[] items)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = new StringContent("{ \"readings\": [" + string.Join(",", items) + "] }", Encoding.UTF8, "application/json"),
        };
        request.Headers.Add(ReadingsApi.ApiKeyHeader, LiveTestProfile.PushKey);
        using var response = await app.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.Accepted, response.StatusCode);
    }

    public static async Task<JsonElement> StateAsync(OpsLvpApp app)
    {
        using var request = new HttpRequestMessage(HttpMethod.Get, new Uri("/api/state", UriKind.Relative));
        request.Headers.Add(OpsLvp.Web.Access.ApiKeyAuthenticationHandler.Header, await ReaderKeyAsync(app));
        using var response = await app.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    public static string Phase(JsonElement state) => state.GetProperty("status").GetProperty("phase").GetString()!;

    /// <summary>Waits until GET /api/state shows <paramref name="phase"/>.</summary>
    public static async Task<JsonElement> WaitForPhaseAsync(OpsLvpApp app, string phase, TimeSpan? timeout = null)
    {
        var deadline = DateTime.UtcNow + (timeout ?? TimeSpan.FromSeconds(15));
        while (true)
        {
            var state = await StateAsync(app);
            if (Phase(state) == phase)
            {
                return state;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"phase stayed {Phase(state)}, expected {phase}");
            }
            await Task.Delay(50);
        }
    }

    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<OpsLvpApp, Task<string>> ReaderKeys = new();

    /// <summary>A hub-read API key for this app (live state needs a role, a display link or such a key).</summary>
    public static Task<string> ReaderKeyAsync(OpsLvpApp app) => ReaderKeys.GetValue(app, a => IssueReaderAsync(a));

    private static async Task<string> IssueReaderAsync(OpsLvpApp app) =>
        (await app.Services.GetRequiredService<OpsLvp.Web.Access.CredentialAdmin>().IssueKeyAsync("test", "live tests (invented)", [OpsLvp.Data.Stores.ApiKeyStore.HubReadScope])).Secret;

    public static AuditStore Audit(OpsLvpApp app) => app.Services.GetRequiredService<AuditStore>();

    public static async Task AssertChainVerifiesAsync(OpsLvpApp app)
    {
        var result = await Audit(app).VerifyAsync();
        Assert.True(result.Ok, $"audit chain broken at {result.FirstBadSequence}");
        Assert.True(result.Entries > 0);
    }

    public static async Task<IReadOnlyList<OpsLvp.Core.Audit.AuditEntry>> EntriesAsync(OpsLvpApp app)
    {
        var head = await Audit(app).GetHeadAsync();
        return head is null ? [] : await Audit(app).GetRangeAsync(1, head.Sequence);
    }
}
