using System.Globalization;
using System.Net;

namespace OpsLvp.Web.Tests.Deployment;

/// <summary>
/// docker-compose.yml (issue 16, "Deployment"): the profile <c>ha</c> (PostgreSQL, Redis, two app nodes, nginx with
/// sticky sessions) and the unchanged embedded default. Parsed with YamlDotNet; nothing is started.
/// </summary>
public sealed class ComposeFileTests
{
    private const string Profile = "ha";

    private static readonly ComposeFile Compose = ComposeFile.Load();

    private static IReadOnlyDictionary<string, IReadOnlyDictionary<string, object?>> Ha => Compose.InProfile(Profile);

    private static KeyValuePair<string, IReadOnlyDictionary<string, object?>> ByImage(string image) =>
        Assert.Single(Ha, s => (ComposeFile.Text(s.Value, "image") ?? "").StartsWith(image + ":", StringComparison.Ordinal));

    private static KeyValuePair<string, IReadOnlyDictionary<string, object?>> Postgres => ByImage("postgres");

    private static KeyValuePair<string, IReadOnlyDictionary<string, object?>> Redis => ByImage("redis");

    private static KeyValuePair<string, IReadOnlyDictionary<string, object?>> Nginx => ByImage("nginx");

    /// <summary>The app nodes: the services built from the repository's Dockerfile.</summary>
    private static List<KeyValuePair<string, IReadOnlyDictionary<string, object?>>> Nodes =>
        Ha.Where(s => s.Value.ContainsKey("build")).OrderBy(s => s.Key, StringComparer.Ordinal).ToList();

    [Fact]
    public void HaProfile_HasPostgresRedisTwoAppNodesAndNginx_AndNothingElse()
    {
        Assert.Equal(2, Nodes.Count);
        Assert.All(Nodes, n => Assert.Equal(".", ComposeFile.Text(n.Value, "build")));
        var named = new[] { Postgres.Key, Redis.Key, Nginx.Key }.Concat(Nodes.Select(n => n.Key)).Order(StringComparer.Ordinal);
        Assert.Equal(Ha.Keys.Order(StringComparer.Ordinal), named);
    }

    [Fact]
    public void EveryHaService_HasAHealthCheck_OfTheRightKind()
    {
        foreach (var (name, service) in Ha)
        {
            var test = ComposeFile.Strings(ComposeFile.Map(service, "healthcheck"), "test");
            Assert.True(test.Count >= 2, $"{name} has no health check test");
            Assert.True(ComposeFile.Map(service, "healthcheck").ContainsKey("interval"), $"{name}'s health check has no interval");
        }
        Assert.Contains("pg_isready", string.Join(' ', HealthTest(Postgres.Value)), StringComparison.Ordinal);
        Assert.Equal(["CMD", "redis-cli", "ping"], HealthTest(Redis.Value));
        // The app's own probe of GET /health (HealthCheckMode), as the Dockerfile's HEALTHCHECK.
        Assert.All(Nodes, n => Assert.Equal(["CMD", "dotnet", "/app/OpsLvp.Web.dll", "--healthcheck"], HealthTest(n.Value)));
        Assert.Contains("/health", string.Join(' ', HealthTest(Nginx.Value)), StringComparison.Ordinal);
    }

    [Fact]
    public void DependsOn_WaitsForHealthyServices()
    {
        foreach (var (name, node) in Nodes)
        {
            Assert.Equal("service_healthy", Condition(node, Postgres.Key));
            Assert.Equal("service_healthy", Condition(node, Redis.Key));
        }
        // The second node waits for the first, so the installation's anchor key is created once.
        Assert.Equal("service_healthy", Condition(Nodes[1].Value, Nodes[0].Key));
        Assert.All(Nodes, n => Assert.Equal("service_healthy", Condition(Nginx.Value, n.Key)));
    }

    [Fact]
    public void TheDatabase_IsOnANamedVolume_AndTheNodesShareTheAnchorKey_OnANamedVolume()
    {
        var declared = ComposeFile.Map(Compose.Root, "volumes").Keys.ToHashSet(StringComparer.Ordinal);
        var database = Assert.Single(Mounts(Postgres.Value), m => m.Target == "/var/lib/postgresql/data");
        Assert.Contains(database.Source, declared);

        var keyPaths = Nodes.Select(n => ComposeFile.Environment(n.Value)["Anchors__KeyPath"]).Distinct().ToList();
        var keyPath = Assert.Single(keyPaths);
        var anchorVolumes = Nodes.Select(n => Assert.Single(Mounts(n.Value), m => keyPath.StartsWith(m.Target + "/", StringComparison.Ordinal)).Source).Distinct().ToList();
        Assert.Contains(Assert.Single(anchorVolumes), declared);
        Assert.NotEqual(database.Source, anchorVolumes[0]);
        // One anchor log per node on the shared volume: two processes never append to one file.
        var logs = Nodes.Select(n => ComposeFile.Environment(n.Value)["Anchors__LogPath"]).ToList();
        Assert.Equal(logs.Count, logs.Distinct(StringComparer.Ordinal).Count());
        Assert.All(logs, l => Assert.StartsWith(Path.GetDirectoryName(keyPath) + "/", l, StringComparison.Ordinal));
    }

    [Fact]
    public void AppNodes_RunOnPostgresAndRedis_WithDistinctNodeIds_AndTrustNginxOnly()
    {
        var postgresEnvironment = ComposeFile.Environment(Postgres.Value);
        var nginxAddress = ComposeFile.Text(ComposeFile.Map(ComposeFile.Map(Nginx.Value, "networks"), "opslvp-ha"), "ipv4_address");
        Assert.True(IPAddress.TryParse(nginxAddress, out _), "nginx needs a fixed address for the nodes to trust");
        foreach (var (name, node) in Nodes)
        {
            var environment = ComposeFile.Environment(node);
            Assert.Equal("Postgres", environment["OpsLvp__Database__Provider"]);
            var connection = environment["ConnectionStrings__OpsLvp"].Split(';', StringSplitOptions.RemoveEmptyEntries)
                .Select(p => p.Split('=', 2)).ToDictionary(p => p[0].Trim(), p => p[1].Trim(), StringComparer.OrdinalIgnoreCase);
            Assert.Equal(Postgres.Key, connection["Host"]);
            Assert.Equal(postgresEnvironment["POSTGRES_DB"], connection["Database"]);
            Assert.Equal(postgresEnvironment["POSTGRES_USER"], connection["Username"]);
            Assert.Equal(postgresEnvironment["POSTGRES_PASSWORD"], connection["Password"]);
            Assert.Equal(Redis.Key, environment["Cluster__Redis"].Split(':')[0]);
            Assert.Equal(nginxAddress, environment["Network__TrustedProxies__0"]);
            Assert.DoesNotContain(environment.Keys, k => k.StartsWith("Network__TrustedProxies__", StringComparison.Ordinal) && k != "Network__TrustedProxies__0");
            // Only nginx is published: a node reached directly would bypass the sticky sessions.
            Assert.Empty(ComposeFile.Strings(node, "ports"));
        }
        var ids = Nodes.Select(n => ComposeFile.Environment(n.Value)["Cluster__NodeId"]).ToList();
        Assert.All(ids, id => Assert.False(string.IsNullOrWhiteSpace(id)));
        Assert.Equal(ids.Count, ids.Distinct(StringComparer.Ordinal).Count());
    }

    [Fact]
    public void AppNodes_PlayTheDemoOnlyAsTheLeader_AtRealSpeed_WithTheSameDemoSettings()
    {
        // docs/deployment.md "The demo in the ha profile": the simulator follows leadership (DemoSimulatorTests); an
        // accelerated demo clock starts at each node's own start, so a takeover would see another time: speed 1 on all
        var demo = Nodes.Select(n => ComposeFile.Environment(n.Value).Where(e => e.Key.StartsWith("Demo__", StringComparison.Ordinal))
            .OrderBy(e => e.Key, StringComparer.Ordinal).ToList()).ToList();
        Assert.Equal(2, demo.Count);
        Assert.All(demo, d => Assert.Equal(demo[0], d));
        var settings = demo[0].ToDictionary(e => e.Key, e => e.Value);
        Assert.Equal("Auto", settings["Demo__Simulator"]);
        Assert.Equal(1.0, double.Parse(settings["Demo__Speed"], CultureInfo.InvariantCulture));
        Assert.False(settings.ContainsKey("Demo__Start"), "a fixed demo start would put the two nodes' clocks apart by their start times");
    }

    [Fact]
    public void Nginx_MountsTheRepositorysConfig_WhoseUpstreamIsStickyAndListsBothNodes()
    {
        var mount = Assert.Single(Mounts(Nginx.Value), m => m.Target.StartsWith("/etc/nginx/", StringComparison.Ordinal));
        var file = Path.GetFullPath(Path.Combine(Compose.Folder, mount.Source));
        Assert.True(File.Exists(file), $"nginx's config {mount.Source} is not in the repository");
        var conf = NginxConf.Load(file);

        var upstream = Assert.Single(conf.All("upstream"));
        var sticky = upstream.Block.Where(d => d.Name is "ip_hash" or "hash" or "sticky").ToList();
        Assert.True(sticky.Count == 1, "the upstream must keep each client on one node (ip_hash, hash or sticky)");
        if (sticky[0].Name == "hash")
        {
            // hashed on something of the client's: its cookie (or a key derived from it) or its address
            var key = sticky[0].Arguments[0];
            Assert.True(key.StartsWith("$cookie_", StringComparison.Ordinal) || key == "$remote_addr" || CookieMap(conf, key), $"hash key {key} is not per client");
        }
        // The nodes listen on 8080 (the Dockerfile's ASPNETCORE_URLS).
        var servers = upstream.Block.Where(d => d.Name == "server").Select(d => d.Arguments[0]).Order(StringComparer.Ordinal).ToList();
        Assert.Equal(Nodes.Select(n => n.Key + ":8080").Order(StringComparer.Ordinal), servers);

        var location = Assert.Single(conf.All("location"), l => l.Arguments.SequenceEqual(["/"]));
        Assert.Equal("http://" + upstream.Arguments[0], Single(location, "proxy_pass")[0]);
        Assert.Equal("1.1", Single(location, "proxy_http_version")[0]);
        var headers = location.Block.Where(d => d.Name == "proxy_set_header").ToDictionary(d => d.Arguments[0], d => d.Arguments[1], StringComparer.OrdinalIgnoreCase);
        Assert.Equal("$http_upgrade", headers["Upgrade"]);
        Assert.True(headers["Connection"] == "upgrade" || MapsUpgrade(conf, headers["Connection"]), "Connection must carry the WebSocket upgrade");
        Assert.Equal("$remote_addr", headers["X-Forwarded-For"]);
        Assert.Equal("$scheme", headers["X-Forwarded-Proto"]);
        // Longer than SignalR's keep-alive (15 s) and client timeout (30 s) defaults (from memory), so an idle but
        // healthy WebSocket is never cut; nginx's own default would be 60 s.
        Assert.InRange(Seconds(Single(location, "proxy_read_timeout")[0]), 31, 3600);
        Assert.InRange(Seconds(Single(location, "proxy_send_timeout")[0]), 31, 3600);
        Assert.True(Seconds(Single(location, "proxy_connect_timeout")[0]) <= 10, "a dead node must be skipped quickly");

        var published = Assert.Single(ComposeFile.Strings(Nginx.Value, "ports"));
        var listen = Single(Assert.Single(conf.All("server"), s => s.Block.Count > 0), "listen")[0];
        Assert.EndsWith(":" + listen, published, StringComparison.Ordinal);
    }

    [Fact]
    public void TheDefault_IsTheOneEmbeddedNodeAsBefore()
    {
        var only = Assert.Single(Compose.Default());
        Assert.Equal("opslvp", only.Key);
        var service = only.Value;
        Assert.Equal(".", ComposeFile.Text(service, "build"));
        Assert.Equal("opslvp:latest", ComposeFile.Text(service, "image"));
        Assert.Equal(["8080:8080"], ComposeFile.Strings(service, "ports"));
        Assert.Equal(["opslvp-data:/data"], ComposeFile.Strings(service, "volumes"));
        Assert.Equal(new Dictionary<string, string> { ["Storage__DataFolder"] = "/data" }, ComposeFile.Environment(service));
        Assert.Equal(["CMD", "dotnet", "/app/OpsLvp.Web.dll", "--healthcheck"], HealthTest(service));
        Assert.False(service.ContainsKey("depends_on"));
        Assert.False(service.ContainsKey("networks"));
        Assert.Equal(["build", "environment", "healthcheck", "image", "ports", "restart", "volumes"], service.Keys.Order(StringComparer.Ordinal));
    }

    private static IReadOnlyList<string> HealthTest(IReadOnlyDictionary<string, object?> service) =>
        ComposeFile.Strings(ComposeFile.Map(service, "healthcheck"), "test");

    private static string? Condition(IReadOnlyDictionary<string, object?> service, string dependency) =>
        ComposeFile.Text(ComposeFile.Map(ComposeFile.Map(service, "depends_on"), dependency), "condition");

    private static List<(string Source, string Target)> Mounts(IReadOnlyDictionary<string, object?> service) =>
        ComposeFile.Strings(service, "volumes").Select(v => v.Split(':')).Select(p => (p[0], p[1])).ToList();

    private static IReadOnlyList<string> Single(NginxDirective block, string name) => Assert.Single(block.Block, d => d.Name == name).Arguments;

    /// <summary>nginx time text (<c>75s</c>, <c>2m</c>, <c>1h</c>, plain seconds) in seconds.</summary>
    private static int Seconds(string text)
    {
        var unit = text[^1];
        var number = char.IsDigit(unit) ? text : text[..^1];
        var value = int.Parse(number, CultureInfo.InvariantCulture);
        return unit switch { 'h' => value * 3600, 'm' => value * 60, _ => value };
    }

    /// <summary>True when <paramref name="variable"/> is a map over a <c>$cookie_…</c> (the sticky key comes from the client's cookie).</summary>
    private static bool CookieMap(NginxDirective conf, string variable) =>
        conf.All("map").Any(m => m.Arguments.Count == 2 && m.Arguments[1] == variable && m.Arguments[0].StartsWith("$cookie_", StringComparison.Ordinal));

    /// <summary>True when <paramref name="variable"/> is a map over <c>$http_upgrade</c> giving <c>upgrade</c> when one is asked for.</summary>
    private static bool MapsUpgrade(NginxDirective conf, string variable) =>
        conf.All("map").Any(m => m.Arguments.Count == 2 && m.Arguments[0] == "$http_upgrade" && m.Arguments[1] == variable
            && m.Block.Any(d => d.Name == "default" && d.Arguments.SequenceEqual(["upgrade"])));
}
