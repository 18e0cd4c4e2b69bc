using System.Diagnostics;
using System.Globalization;
using System.Net.Sockets;
using System.Text;
using System.Text.RegularExpressions;
using OpsLvp.Web.Tests.Deployment;

namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>
/// A throwaway nginx (Debian's <c>nginx</c>) in front of test app nodes, running the repository's own
/// <c>src/OpsLvp.Web/deploy/nginx/opslvp-ha.conf</c> (the one docker-compose's profile <c>ha</c> mounts) with its upstream
/// servers replaced by the nodes' addresses and its <c>listen</c> by a free port of 127.0.0.1; everything else (sticky
/// key, WebSocket headers, forwarded headers, timeouts) is the file's. Pid, logs and temporary files live in a temporary
/// folder; <c>daemon off</c>, killed when disposed. The access log names the node of each request
/// (<see cref="AccessLog"/>).
/// </summary>
public sealed partial class NginxProcess : IDisposable
{
    /// <summary>Request header a test sets to tell its clients apart in <see cref="AccessLog"/>.</summary>
    public const string ClientHeader = "X-OpsLvp-Test-Client";

    private readonly Process _process;

    private NginxProcess(Process process, string folder, int port, string siteConfig)
    {
        _process = process;
        Folder = folder;
        BaseAddress = new Uri($"http://127.0.0.1:{port}/");
        SiteConfig = siteConfig;
    }

    /// <summary>Path of <c>nginx</c>; <c>OPSLVP_NGINX</c> overrides.</summary>
    public static string? Program { get; } = Find();

    /// <summary>Null when nginx tests can run (or must, under <c>OPSLVP_REQUIRE_SERVICES=1</c>); else why they are skipped.</summary>
    public static string? SkipReason =>
        Program is null && !LocalServices.Required
            ? "nginx not found (apt install nginx, or set OPSLVP_NGINX); set OPSLVP_REQUIRE_SERVICES=1 to fail instead"
            : null;

    /// <summary>The repository's nginx configuration for the profile <c>ha</c>.</summary>
    public static string RepositoryConfig => Path.Combine(ComposeFile.RepositoryRoot(), "src", "OpsLvp.Web", "deploy", "nginx", "opslvp-ha.conf");

    public Uri BaseAddress { get; }

    public string Folder { get; }

    /// <summary>The repository's file as rendered for this run.</summary>
    public string SiteConfig { get; }

    /// <summary>Starts nginx in front of <paramref name="nodes"/> (as many as the repository's upstream lists) and waits (up to 60 s) until it accepts connections.</summary>
    /// <exception cref="InvalidOperationException">nginx is missing, the file does not fit, or nginx did not start (the message says why, with nginx's error log).</exception>
    public static async Task<NginxProcess> StartAsync(IReadOnlyList<Uri> nodes)
    {
        ArgumentNullException.ThrowIfNull(nodes);
        var program = Program
            ?? throw new InvalidOperationException("nginx not found (apt install nginx, or set OPSLVP_NGINX); OPSLVP_REQUIRE_SERVICES=1 is set, so the test fails instead of being skipped");
        // the port was free when it was picked; a server another test started meanwhile may have taken it (nginx then
        // cannot listen and exits): a new port, a few times
        for (var attempt = 1; ; attempt++)
        {
            try
            {
                return await StartOnFreePortAsync(program, nodes);
            }
            catch (PortTakenException) when (attempt < 3)
            {
            }
        }
    }

    private sealed class PortTakenException(string message) : InvalidOperationException(message);

    private static async Task<NginxProcess> StartOnFreePortAsync(string program, IReadOnlyList<Uri> nodes)
    {
        var folder = Path.Combine(Path.GetTempPath(), "opslvp-nginx", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        var port = LocalServices.FreePort();
        var site = Render(File.ReadAllText(RepositoryConfig), nodes, port);
        File.WriteAllText(Path.Combine(folder, "site.conf"), site);
        File.WriteAllText(Path.Combine(folder, "nginx.conf"), MainConfig(folder));

        var info = new ProcessStartInfo(program) { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var argument in new[] { "-p", folder + "/", "-c", Path.Combine(folder, "nginx.conf"), "-e", Path.Combine(folder, "error.log") })
        {
            info.ArgumentList.Add(argument);
        }
        var process = Process.Start(info) ?? throw new InvalidOperationException("could not start nginx");
        process.OutputDataReceived += (_, _) => { };
        process.ErrorDataReceived += (_, _) => { };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        var nginx = new NginxProcess(process, folder, port, site);
        var deadline = DateTime.UtcNow.AddSeconds(60);
        while (true)
        {
            try
            {
                using var client = new TcpClient();
                await client.ConnectAsync("127.0.0.1", port);
                // nginx writes its pid file once it listens: without it the answer came from whoever else holds the port
                if (nginx.ListensItself())
                {
                    return nginx;
                }
            }
            catch (SocketException) when (DateTime.UtcNow < deadline && !process.HasExited)
            {
            }
            if (process.HasExited || DateTime.UtcNow >= deadline)
            {
                var exited = process.HasExited;
                var errors = nginx.ErrorLog();
                nginx.Dispose();
                var message = $"nginx on port {port} did not start (exited: {exited}): {errors}";
                throw exited && errors.Contains("Address already in use", StringComparison.Ordinal) ? new PortTakenException(message) : new InvalidOperationException(message);
            }
            await Task.Delay(100);
        }
    }

    /// <summary>
    /// The repository's site configuration with the upstream's <c>server</c> entries replaced, in order, by
    /// <paramref name="nodes"/> and <c>listen</c> by 127.0.0.1:<paramref name="port"/>.
    /// </summary>
    public static string Render(string config, IReadOnlyList<Uri> nodes, int port)
    {
        ArgumentNullException.ThrowIfNull(nodes);
        var upstream = Assert.Single(NginxConf.Parse(config).All("upstream"));
        var servers = upstream.Block.Where(d => d.Name == "server").Select(d => d.Arguments[0]).ToList();
        if (servers.Count != nodes.Count)
        {
            throw new InvalidOperationException($"the upstream lists {servers.Count} servers; {nodes.Count} nodes were given");
        }
        for (var i = 0; i < servers.Count; i++)
        {
            var pattern = new Regex(@"(\bserver\s+)" + Regex.Escape(servers[i]) + @"(?=[\s;])");
            config = pattern.Replace(config, "${1}" + nodes[i].Host + ":" + nodes[i].Port.ToString(CultureInfo.InvariantCulture), 1);
        }
        var listen = ListenPattern();
        if (listen.Matches(config).Count != 1)
        {
            throw new InvalidOperationException("the configuration must have exactly one listen directive");
        }
        return listen.Replace(config, "listen 127.0.0.1:" + port.ToString(CultureInfo.InvariantCulture) + ";");
    }

    /// <summary>The requests nginx passed on so far: which node (upstream address) served which client (<see cref="ClientHeader"/>).</summary>
    public IReadOnlyList<NginxLogLine> AccessLog()
    {
        var path = Path.Combine(Folder, "access.log");
        if (!File.Exists(path))
        {
            return [];
        }
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite);
        using var reader = new StreamReader(stream, Encoding.UTF8);
        var lines = new List<NginxLogLine>();
        while (reader.ReadLine() is { } line)
        {
            var parts = line.Split('\t');
            if (parts.Length == 4)
            {
                lines.Add(new NginxLogLine(parts[0], parts[1], int.Parse(parts[2], CultureInfo.InvariantCulture), parts[3]));
            }
        }
        return lines;
    }

    private bool ListensItself()
    {
        try
        {
            var pid = File.ReadAllText(Path.Combine(Folder, "nginx.pid")).Trim();
            return pid == _process.Id.ToString(CultureInfo.InvariantCulture);
        }
        catch (IOException)
        {
            return false;
        }
    }

    public string ErrorLog()
    {
        var path = Path.Combine(Folder, "error.log");
        try
        {
            return File.Exists(path) ? File.ReadAllText(path) : "(no error log)";
        }
        catch (IOException ex)
        {
            return ex.Message;
        }
    }

    public void Dispose()
    {
        try
        {
            if (!_process.HasExited)
            {
                _process.Kill(entireProcessTree: true);
                _process.WaitForExit(10_000);
            }
        }
        catch (InvalidOperationException)
        {
        }
        _process.Dispose();
        try
        {
            Directory.Delete(Folder, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    private static string MainConfig(string folder)
    {
        // As root (CI containers) nginx would switch its workers to "nobody", who cannot use the temporary folder.
        var user = Environment.IsPrivilegedProcess ? "user root;\n" : "";
        return user + $$"""
            daemon off;
            master_process on;
            worker_processes 1;
            pid {{folder}}/nginx.pid;
            error_log {{folder}}/error.log info;
            events { worker_connections 512; }
            http {
                log_format opslvp_test "$upstream_addr\t$http_x_opslvp_test_client\t$status\t$request";
                access_log {{folder}}/access.log opslvp_test;
                client_body_temp_path {{folder}}/client_body;
                proxy_temp_path {{folder}}/proxy;
                fastcgi_temp_path {{folder}}/fastcgi;
                uwsgi_temp_path {{folder}}/uwsgi;
                scgi_temp_path {{folder}}/scgi;
                include {{folder}}/site.conf;
            }
            """;
    }

    private static string? Find()
    {
        var configured = Environment.GetEnvironmentVariable("OPSLVP_NGINX");
        if (!string.IsNullOrWhiteSpace(configured))
        {
            return File.Exists(configured) ? configured : null;
        }
        return new[] { "/usr/sbin/nginx", "/usr/local/sbin/nginx", "/usr/bin/nginx" }.FirstOrDefault(File.Exists);
    }

    [GeneratedRegex(@"\blisten\s+[^;]+;")]
    private static partial Regex ListenPattern();
}
