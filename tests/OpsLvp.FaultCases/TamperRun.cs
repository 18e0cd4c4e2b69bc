using System.Globalization;
using System.Net;
using System.Text;
using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// The fault runner's <c>--tamper</c> (docs/reliability.md "Tamper evidence"): for every case of
/// <see cref="TamperCases.All"/>, the real server process records an invented night on a fresh folder (RVR 1500, 900 m
/// → preparation, 400 m → LVP in force, <see cref="FaultProfile"/>) and is stopped with SIGTERM (the stop writes the last
/// anchor); <c>opslvp audit verify --db --anchors --public-key</c> must find it clean; the case is applied; verify must
/// then give the case's answer (<see cref="TamperFiles.JudgeVerify"/>) and the next start's <c>/health</c> the case's
/// (<see cref="TamperFiles.JudgeStart"/>). Two rows per case: "… audit verify" and "… next start". The same cases run
/// in <c>dotnet test</c> against the in-process app (<c>tests/OpsLvp.Web.Tests/Tamper/TamperTests.cs</c>).
/// </summary>
public static class TamperRun
{
    public const string Group = "tamper";

    public static async Task RunAsync(int rounds, string root, FaultTally tally, Action<string> log)
    {
        ArgumentNullException.ThrowIfNull(tally);
        ArgumentNullException.ThrowIfNull(log);
        for (var round = 1; round <= rounds; round++)
        {
            foreach (var tamper in TamperCases.All)
            {
                var target = new Target(Path.Combine(root, string.Create(CultureInfo.InvariantCulture, $"{round}-{tamper.Name}"), "data"));
                try
                {
                    await RunCaseAsync(tamper, target, tally, log);
                }
                finally
                {
                    Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
                }
            }
        }
    }

    private static async Task RunCaseAsync(TamperCase tamper, Target target, FaultTally tally, Action<string> log)
    {
        var verifyRow = $"{tamper.Name}: audit verify";
        var startRow = $"{tamper.Name}: next start";
        try
        {
            await target.RecordAsync();
        }
        catch (Exception ex) when (ex is InvalidOperationException or HttpRequestException or TimeoutException)
        {
            tally.Broke(Group, verifyRow, $"recording failed: {ex.Message}");
            return;
        }
        var (before, beforeOutput, beforeError) = target.Verify();
        if (before != 0 || beforeOutput.ValueKind != JsonValueKind.Object
            || beforeOutput.GetProperty("anchors").GetProperty("valid").GetInt32() < 1
            || beforeOutput.GetProperty("readings").GetProperty("covering_entries").GetInt64() < 2
            || beforeOutput.GetProperty("state_seal").GetString() != "ok")
        {
            tally.Broke(Group, verifyRow, $"the untouched recording does not verify clean with an anchor, 2 covering entries and the seal: exit {before}: {beforeOutput} {beforeError}");
            return;
        }

        try
        {
            await tamper.Apply(target);
        }
        catch (InvalidOperationException ex)
        {
            tally.Broke(Group, verifyRow, ex.Message);
            return;
        }
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();

        var (code, verified, stderr) = target.Verify();
        var wrongVerify = TamperFiles.JudgeVerify(tamper, code, verified, stderr);
        Count(tally, verifyRow, wrongVerify);
        log($"{tamper.Name}: audit verify exit {code}, anomalies {Kinds(verified)}{(wrongVerify is null ? "" : " BROKE: " + wrongVerify)}");

        using var restarted = await ServerProcess.StartAsync(target.Folder, target.Profile);
        using var response = await restarted.Client.GetAsync(new Uri("/health", UriKind.Relative));
        var health = JsonDocument.Parse(await response.Content.ReadAsStringAsync()).RootElement.Clone();
        var wrongStart = TamperFiles.JudgeStart(tamper, health);
        Count(tally, startRow, wrongStart);
        var stopped = health.GetProperty("engine").TryGetProperty("stopped", out var s) && s.ValueKind == JsonValueKind.String ? s.GetString() : null;
        log($"{tamper.Name}: next start {health.GetProperty("status").GetString()}{(stopped is null ? "" : ", stopped: " + stopped)}{(wrongStart is null ? "" : " BROKE: " + wrongStart)}");
        await restarted.StopAsync();
    }

    private static void Count(FaultTally tally, string row, string? wrong)
    {
        if (wrong is null)
        {
            tally.Held(Group, row);
        }
        else
        {
            tally.Broke(Group, row, wrong);
        }
    }

    private static string Kinds(JsonElement verified) =>
        verified.ValueKind == JsonValueKind.Object
            ? "[" + string.Join(", ", verified.GetProperty("anomalies").EnumerateArray().Select(a => a.GetProperty("kind").GetString())) + "]"
            : "(no JSON)";

    private sealed class Target(string folder) : ITamperTarget
    {
        public string Folder { get; } = folder;

        public string Profile { get; } = FaultProfile.Write(folder);

        public string Database => Path.Combine(Folder, "opslvp.db");

        public string AnchorLog => Path.Combine(Folder + "-anchors", "anchors.jsonl");

        public string TdzSensor => FaultProfile.Tdz;

        public Task<object?> SqlAsync(string sql) => TamperFiles.SqlAsync(Database, sql);

        public async Task StartAndStopAsync()
        {
            using var again = await ServerProcess.StartAsync(Folder, Profile);
            await again.StopAsync();
        }

        public (int Code, JsonElement Output, string Stderr) Verify() =>
            TamperFiles.Verify(Database, AnchorLog, Path.Combine(Folder + "-anchors", "anchor-key.pub.pem"));

        /// <summary>The invented night: 1500 m, 900 m (preparation), 400 m (LVP in force), each waited for in the state row; then SIGTERM.</summary>
        public async Task RecordAsync()
        {
            using var server = await ServerProcess.StartAsync(Folder, Profile);
            var now = DateTimeOffset.UtcNow;
            await PushAsync(server, now.AddSeconds(-3), 1500);
            await PushAsync(server, now.AddSeconds(-2), 900);
            await WaitForPhaseAsync("Preparation");
            await PushAsync(server, now.AddSeconds(-1), 400);
            await WaitForPhaseAsync("Active");
            var exit = await server.StopAsync();
            if (exit != "exit code 0")
            {
                throw new InvalidOperationException($"the recording server did not stop orderly: {exit}");
            }
        }

        private static async Task PushAsync(ServerProcess server, DateTimeOffset time, int rvr)
        {
            var item = string.Create(CultureInfo.InvariantCulture,
                $"{{\"time\":\"{time.UtcDateTime:yyyy-MM-dd'T'HH:mm:ss.fff'Z'}\",\"sensor\":\"{FaultProfile.Tdz}\",\"kind\":\"rvr\",\"value\":{rvr},\"status\":\"ok\"}}");
            using var request = new HttpRequestMessage(HttpMethod.Post, new Uri("/api/readings", UriKind.Relative))
            {
                Content = new StringContent("{\"readings\":[" + item + "]}", Encoding.UTF8, "application/json"),
            };
            request.Headers.Add("X-Api-Key", FaultProfile.PushKey);
            using var response = await server.Client.SendAsync(request);
            if (response.StatusCode != HttpStatusCode.Accepted)
            {
                throw new InvalidOperationException($"push of RVR {rvr} m answered {(int)response.StatusCode}: {await response.Content.ReadAsStringAsync()}");
            }
        }

        private async Task WaitForPhaseAsync(string phase)
        {
            var deadline = DateTime.UtcNow.AddSeconds(60);
            while (!(await SqlAsync($"SELECT instr(state_json, '\"Phase\":\"{phase}\"') FROM engine_state;") is long at && at > 0))
            {
                if (DateTime.UtcNow > deadline)
                {
                    throw new TimeoutException($"the state row did not reach {phase} within 60 s");
                }
                await Task.Delay(100);
            }
        }
    }
}
