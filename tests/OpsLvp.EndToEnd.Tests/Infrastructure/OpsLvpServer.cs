using System.Collections.Concurrent;
using System.Diagnostics;
using System.Globalization;
using System.Net.Http.Json;
using System.Text.RegularExpressions;

namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// The real OpsLvp web app as a separate process (the built OpsLvp.Web.dll) on Kestrel at 127.0.0.1:{random port},
/// with a temporary data folder, the invented <see cref="TestProfile"/>, push ingest under <see cref="ApiKey"/> and
/// the demo simulator off. A separate process so a test can take the server away as a crash would.
/// </summary>
public sealed partial class OpsLvpServer : IAsyncDisposable
{
    /// <summary>Invented test key.</summary>
    public const string ApiKey = "e2e-key-0123456789abcdef";

    /// <summary>The configuration key naming the aerodrome profile file (the engine host's setting).</summary>
    public const string ProfileSetting = "Engine__ProfilePath";

    private static readonly TimeSpan s_startTimeout = TimeSpan.FromSeconds(120); // three test projects share CI's two cores

    private readonly Process _process;
    private readonly ConcurrentQueue<string> _output;

    private readonly bool _ownsAccounts;

    private OpsLvpServer(Process process, ConcurrentQueue<string> output, Uri baseAddress, string dataFolder, TestAccounts accounts, bool ownsAccounts)
    {
        Accounts = accounts;
        _ownsAccounts = ownsAccounts;
        _process = process;
        _output = output;
        BaseAddress = baseAddress;
        DataFolder = dataFolder;
        Client = new HttpClient { BaseAddress = baseAddress, Timeout = TimeSpan.FromSeconds(20) };
    }

    public Uri BaseAddress { get; }

    public string DataFolder { get; }

    public HttpClient Client { get; }

    /// <summary>The invented accounts seeded before start (<see cref="TestAccounts"/>), and display links.</summary>
    public TestAccounts Accounts { get; }

    /// <summary>What the server wrote so far, for failure messages.</summary>
    public string Output => string.Join(Environment.NewLine, _output);

    /// <summary>Starts the app on <paramref name="profileJson"/> (default <see cref="TestProfile.Json"/>) with the standard accounts seeded.</summary>
    public static async Task<OpsLvpServer> StartAsync(string? profileJson = null, IReadOnlyDictionary<string, string>? settings = null)
    {
        var dataFolder = NewDataFolder();
        var accounts = TestAccounts.Open(dataFolder);
        await accounts.SeedStandardAsync();
        return await StartAsync(dataFolder, accounts, ownsAccounts: true, profileJson, settings);
    }

    /// <summary>
    /// Starts the app as <see cref="StartAsync(string?, IReadOnlyDictionary{string, string}?)"/> does, on
    /// <paramref name="dataFolder"/> (an existing, empty folder the caller prepared, e.g. a small filesystem for a storage
    /// fault); its contents are deleted with the server, the folder itself is the caller's.
    /// </summary>
    public static async Task<OpsLvpServer> StartOnFolderAsync(string dataFolder, string? profileJson = null, IReadOnlyDictionary<string, string>? settings = null)
    {
        var accounts = TestAccounts.Open(dataFolder);
        await accounts.SeedStandardAsync();
        return await StartAsync(dataFolder, accounts, ownsAccounts: true, profileJson, settings);
    }

    /// <summary>
    /// Starts one node of a cluster on <paramref name="accounts"/>' database (seeded by the caller, shared with the other
    /// nodes and not disposed with this one); <paramref name="settings"/> name the provider, connection string and
    /// <c>Cluster:*</c>. The node's data folder is its own.
    /// </summary>
    public static Task<OpsLvpServer> StartNodeAsync(TestAccounts accounts, IReadOnlyDictionary<string, string> settings, string? profileJson = null) =>
        StartAsync(NewDataFolder(), accounts, ownsAccounts: false, profileJson, settings);

    private static string NewDataFolder()
    {
        var dataFolder = Path.Combine(Path.GetTempPath(), "opslvp-e2e", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dataFolder);
        return dataFolder;
    }

    private static async Task<OpsLvpServer> StartAsync(string dataFolder, TestAccounts accounts, bool ownsAccounts, string? profileJson, IReadOnlyDictionary<string, string>? settings)
    {
        var dll = WebAppDll();
        var profile = Path.Combine(dataFolder, "profile.json");
        await File.WriteAllTextAsync(profile, profileJson ?? TestProfile.Json);

        var start = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = Path.GetDirectoryName(dll)!,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        start.ArgumentList.Add(dll);
        start.ArgumentList.Add("--urls");
        start.ArgumentList.Add("http://127.0.0.1:0");
        start.Environment["ASPNETCORE_ENVIRONMENT"] = "Development";
        start.Environment["Storage__DataFolder"] = dataFolder;
        start.Environment[ProfileSetting] = profile;
        start.Environment["Engine__TickInterval"] = "00:00:00.200";
        start.Environment["Demo__Simulator"] = "Off";
        start.Environment["Feeds__Push__ApiKeys__0__Name"] = "e2e";
        start.Environment["Feeds__Push__ApiKeys__0__Key"] = ApiKey;
        start.Environment["Logging__LogLevel__Default"] = "Warning";
        // Every browser test signs in from 127.0.0.1, many as the same account: the throttles are tested in OpsLvp.Web.Tests.
        start.Environment["Access__SignInPerAddressPerMinute"] = "1000";
        start.Environment["Access__SignInAttemptsPerAccount"] = "1000";
        start.Environment["Access__SignInAttemptsPerAccountAllAddresses"] = "1000";
        start.Environment["Logging__LogLevel__Microsoft.Hosting.Lifetime"] = "Information";
        foreach (var (key, value) in settings ?? new Dictionary<string, string>())
        {
            start.Environment[key] = value;
        }

        var output = new ConcurrentQueue<string>();
        var listening = new TaskCompletionSource<Uri>(TaskCreationOptions.RunContinuationsAsynchronously);
        var process = new Process { StartInfo = start, EnableRaisingEvents = true };
        process.OutputDataReceived += (_, e) => OnLine(e.Data);
        process.ErrorDataReceived += (_, e) => OnLine(e.Data);
        process.Exited += (_, _) => listening.TrySetException(new InvalidOperationException("the web app exited during start"));
        process.Start();
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();

        try
        {
            var address = await listening.Task.WaitAsync(s_startTimeout);
            return new OpsLvpServer(process, output, address, dataFolder, accounts, ownsAccounts);
        }
        catch (Exception ex) when (ex is TimeoutException or InvalidOperationException)
        {
            Stop(process);
            process.Dispose();
            if (ownsAccounts)
            {
                await accounts.DisposeAsync();
            }
            TryDelete(dataFolder);
            throw new InvalidOperationException($"OpsLvp.Web did not start ({ex.Message}); its output:{Environment.NewLine}{string.Join(Environment.NewLine, output)}", ex);
        }

        void OnLine(string? line)
        {
            if (line is null)
            {
                return;
            }
            output.Enqueue(line);
            if (ListeningLine().Match(line) is { Success: true } m)
            {
                listening.TrySetResult(new Uri(m.Groups[1].Value));
            }
        }
    }

    /// <summary>POSTs readings stamped <paramref name="time"/> to /api/readings and checks they were all accepted.</summary>
    public async Task PushAsync(DateTimeOffset time, params (string Sensor, string Kind, double Value)[] readings)
    {
        var (status, text) = await TryPushAsync(time, readings);
        Assert.True((int)status is >= 200 and < 300, $"POST /api/readings answered {(int)status}: {text}");
        Assert.Contains($"\"accepted\":{readings.Length}", text.Replace(" ", "", StringComparison.Ordinal), StringComparison.Ordinal);
    }

    /// <summary>POSTs readings stamped <paramref name="time"/> to /api/readings; returns the answer whatever it is (a standby answers 503).</summary>
    public async Task<(System.Net.HttpStatusCode Status, string Text)> TryPushAsync(DateTimeOffset time, params (string Sensor, string Kind, double Value)[] readings)
    {
        var body = new
        {
            readings = readings.Select(r => new
            {
                time = time.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", CultureInfo.InvariantCulture),
                sensor = r.Sensor,
                kind = r.Kind,
                value = r.Value,
                status = "ok",
            }),
        };
        using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
        {
            Content = JsonContent.Create(body),
        };
        request.Headers.Add("X-Api-Key", ApiKey);
        using var response = await Client.SendAsync(request);
        return (response.StatusCode, await response.Content.ReadAsStringAsync());
    }

    /// <summary>Takes the server away at once, as a crash or a pulled cable would (the process is killed).</summary>
    public void Kill() => Stop(_process);

    /// <summary>True once the process has ended (killed or exited).</summary>
    public bool HasExited => _process.HasExited;

    public async ValueTask DisposeAsync()
    {
        Client.Dispose();
        Stop(_process);
        await _process.WaitForExitAsync().WaitAsync(TimeSpan.FromSeconds(10)).ConfigureAwait(false);
        _process.Dispose();
        if (_ownsAccounts)
        {
            await Accounts.DisposeAsync();
        }
        TryDelete(DataFolder);
    }

    /// <summary>src/OpsLvp.Web/bin/{same configuration as this test build}/net10.0/OpsLvp.Web.dll.</summary>
    private static string WebAppDll()
    {
        var here = new DirectoryInfo(AppContext.BaseDirectory);
        var framework = here.Name;
        var configuration = here.Parent!.Name;
        for (var dir = here; dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.sln")))
            {
                var dll = Path.Combine(dir.FullName, "src", "OpsLvp.Web", "bin", configuration, framework, "OpsLvp.Web.dll");
                return File.Exists(dll)
                    ? dll
                    : throw new InvalidOperationException($"{dll} is missing: build src/OpsLvp.Web in {configuration} first");
            }
        }
        throw new InvalidOperationException($"no OpsLvp.sln above {AppContext.BaseDirectory}");
    }

    private static void Stop(Process process)
    {
        try
        {
            if (!process.HasExited)
            {
                process.Kill(entireProcessTree: true);
            }
        }
        catch (InvalidOperationException)
        {
            // Already gone.
        }
    }

    private static void TryDelete(string folder)
    {
        try
        {
            Directory.Delete(folder, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    [GeneratedRegex(@"Now listening on:\s*(http://\S+)")]
    private static partial Regex ListeningLine();
}
