using System.Diagnostics;
using System.Globalization;
using System.Text.Json;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using Npgsql;
using NpgsqlTypes;
using OpsLvp.Benchmarks.Engine;
using OpsLvp.Benchmarks.Live;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Benchmarks.Services;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Readings;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Access;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Review;

namespace OpsLvp.Benchmarks.Year;

/// <summary>
/// Issue 16 "Data over time": a database of each provider filled with <see cref="BenchOptions.Days"/> days of
/// 15-second readings from the demo aerodrome's 9 RVR sensors and 2 ceilometers (365 days: 23.1 million rows;
/// invented values, one LVP episode on the last night with its audit entries), bulk inserted (SQLite: one transaction
/// per chunk with a prepared statement; PostgreSQL: binary COPY); then the real app started on it, timed to
/// <c>/health</c> answering, one review load (<see cref="StoreEpisodeSource.LoadAsync"/>, what the episode list and
/// one episode read), <c>GET /api/state</c>, and the database's size on disk.
/// </summary>
public static class YearHarness
{
    private const int Chunk = 1_000_000;

    private const int RowsPerInsert = 100;

    public static async Task RunAsync(BenchOptions options, ResultsBook book, string command)
    {
        var section = string.Create(CultureInfo.InvariantCulture, $"A year of readings: {options.Days} days of 15 s readings, 11 sensors");
        foreach (var provider in new[] { OpsLvpDatabase.SqliteProvider, OpsLvpDatabase.PostgresProvider })
        {
            if (OpsLvpDatabase.IsPostgres(provider) && BenchPostgres.FindBin() is null)
            {
                book.Note("year: PostgreSQL not measured: server programs not found.");
                continue;
            }
            await MeasureAsync(provider, options, book, section, command);
        }
    }

    private static async Task MeasureAsync(string provider, BenchOptions options, ResultsBook book, string section, string command)
    {
        var postgres = OpsLvpDatabase.IsPostgres(provider);
        var folder = Path.Combine(options.DataDir ?? Path.Combine(Path.GetTempPath(), "opslvp-bench"), "year-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        var file = Path.Combine(folder, "opslvp.db");
        var connectionString = postgres ? BenchPostgres.Shared.CreateDatabase() : new SqliteConnectionStringBuilder { DataSource = file }.ToString();
        var dbOptions = postgres ? OpsLvpDatabase.PostgresOptions(connectionString) : OpsLvpDatabase.SqliteOptions(connectionString);
        var factory = new OpsLvpDbContextFactory(dbOptions);
        await DatabaseStartup.MigrateAndCheckAsync(factory);
        var name = postgres ? "PostgreSQL" : "SQLite";
        try
        {
            // one LVP episode on the last night, its audit entries from the replay (as the review benchmark does)
            var profile = BenchData.DemoProfile();
            var start = BenchData.Start;
            var lastDay = start.AddDays(options.Days - 1);
            var night = BenchData.FogNight(profile, 24, lastDay);
            using (var audit = new AuditStore(factory))
            {
                var events = ReplayRunner.Run(profile, night, []).Events;
                await audit.AppendAsync(events.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry).ToList());
            }

            var settings = new Dictionary<string, string?>
            {
                [OpsLvpDatabase.ProviderSetting] = provider,
                [postgres ? OpsLvpDatabase.PostgresConnectionStringSetting : OpsLvpDatabase.ConnectionStringSetting] = connectionString,
                // one installation, one anchor key across its starts (docs/audit.md "Anchors"): each BenchServer has its own
                // data folder, and a start with another key would find the state row sealed by a key it does not hold
                ["Anchors:KeyPath"] = Path.Combine(folder, "anchor-key.pem"),
                ["Anchors:LogPath"] = Path.Combine(folder, "anchors.jsonl"),
            };

            // the same start, review and state on the EMPTY database first (migrated, the episode's audit entries only),
            // so the filled figures below can be read against it
            // one unmeasured start first, so neither measured start pays for the process's first JIT of the app's code
            Progress($"{name}: warm-up start on the empty database (not measured)");
            await MeasureAppAsync(settings, name, "warm-up", null, section, command);
            Progress($"{name}: app start on the empty database");
            await MeasureAppAsync(settings, name, "empty database", book, section, command);
            SqliteConnection.ClearAllPools();
            NpgsqlConnection.ClearAllPools();

            Progress($"{name}: bulk fill of {options.Days} days");
            var fill = Stopwatch.StartNew();
            var rows = postgres
                ? await CopyPostgresAsync(connectionString, Readings(profile, start, options.Days - 1, night))
                : InsertSqlite(file, Readings(profile, start, options.Days - 1, night));
            fill.Stop();
            book.Add(new ResultRow(section, $"{name}: bulk insert of {rows:N0} rows", Seconds(fill.Elapsed), null, null, null,
                string.Create(CultureInfo.InvariantCulture, $"{rows / fill.Elapsed.TotalSeconds:N0} rows/s ({(postgres ? "binary COPY, max_wal_size 8GB for the fill only" : $"prepared {RowsPerInsert}-row INSERT, one transaction per {Chunk:N0} rows, synchronous=OFF for the fill only")})"), command));
            Progress(string.Create(CultureInfo.InvariantCulture, $"{name}: filled {rows:N0} rows in {fill.Elapsed.TotalSeconds:0} s"));
            book.Add(new ResultRow(section, $"{name}: disk size", Megabytes(postgres ? await PostgresSizeAsync(connectionString) : SqliteSize(file)), null, null, null,
                postgres ? "pg_database_size" : "database file + WAL", command));

            Progress($"{name}: app start on the filled database");
            await MeasureAppAsync(settings, name, string.Create(CultureInfo.InvariantCulture, $"{rows:N0} rows"), book, section, command);
            Progress($"{name}: done");
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            NpgsqlConnection.ClearAllPools();
            BenchFiles.TryDeleteFolder(folder);
        }
    }

    /// <summary>Starts the app on the database, times start to the first /health 200, one review load and the first /api/state; stops it.</summary>
    /// <param name="book">Where the figures go; null: a warm-up, only printed.</param>
    private static async Task MeasureAppAsync(Dictionary<string, string?> settings, string name, string holding, ResultsBook? book, string section, string command)
    {
        var startup = Stopwatch.StartNew();
        await using var server = BenchServer.Start(settings);
        using var http = new HttpClient { BaseAddress = server.BaseAddress, Timeout = TimeSpan.FromMinutes(5) };
        string health;
        while (true)
        {
            using var response = await http.GetAsync(new Uri("/health", UriKind.Relative));
            health = await response.Content.ReadAsStringAsync();
            if (response.IsSuccessStatusCode)
            {
                break;
            }
            if (startup.Elapsed > TimeSpan.FromMinutes(10))
            {
                throw new TimeoutException($"/health did not answer 200 within 10 minutes on {name} ({holding}): {health}");
            }
            await Task.Delay(50);
        }
        startup.Stop();
        var status = JsonDocument.Parse(health).RootElement.TryGetProperty("status", out var s) ? s.GetString() : "?";
        // the start's engine_started entry covers (digests) every reading stored since the last covering entry (docs/audit.md "Readings covered")
        var covering = await server.Services.GetRequiredService<AuditStore>().GetLastContainingAsync($"\"{ReadingsCoverage.Member}\"");
        var covered = covering is null ? null : ReadingsCoverage.From(covering.PayloadJson);
        book?.Add(new ResultRow(section, $"{name}, {holding}: app start to /health 200", Seconds(startup.Elapsed), null, null, null,
            string.Create(CultureInfo.InvariantCulture, $"status \"{status}\" (migrations checked, engine restored, no feed); the start's covering entry ({covering?.Kind ?? "none"}) digested {covered?.Count ?? 0:N0} readings"), command));
        Progress($"{name}, {holding}: /health 200 after {Seconds(startup.Elapsed)}");

        var source = new StoreEpisodeSource(server.Services);
        var review = Stopwatch.StartNew();
        var record = await source.LoadAsync();
        review.Stop();
        book?.Add(new ResultRow(section, $"{name}, {holding}: one review load (episode list + one episode)", Millis(review.Elapsed), null, null, null,
            string.Create(CultureInfo.InvariantCulture, $"StoreEpisodeSource.LoadAsync in the running app: {record.Readings.Count:N0} readings of the episode window"), command));
        Progress($"{name}, {holding}: review load {Millis(review.Elapsed)}");

        var key = await server.IssuePushKeyAsync();
        using var request = new HttpRequestMessage(HttpMethod.Get, "/api/state");
        request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
        var stateClock = Stopwatch.StartNew();
        using var state = await http.SendAsync(request);
        var body = await state.Content.ReadAsByteArrayAsync();
        stateClock.Stop();
        book?.Add(new ResultRow(section, $"{name}, {holding}: GET /api/state", Millis(stateClock.Elapsed), null, null, null,
            string.Create(CultureInfo.InvariantCulture, $"HTTP {(int)state.StatusCode}, {body.Length:N0} bytes (first request, cold)"), command));
        Progress($"{name}, {holding}: /api/state {Millis(stateClock.Elapsed)}");
    }

    /// <summary>A timestamped line on the console, so a long run shows which phase it is in.</summary>
    private static void Progress(string what) =>
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"[year {TimeProvider.System.GetUtcNow():HH:mm:ss}] {what}"));

    private static IEnumerable<ReceivedReading> Readings(OpsLvp.Core.Profile.AerodromeProfile profile, DateTimeOffset start, int fairDays, List<Reading> night)
    {
        var rvr = BenchData.RvrSensors(profile);
        var ceilo = BenchData.Ceilometers(profile);
        var random = new Random(BenchData.Seed);
        for (var i = 0; i < fairDays * 24 * 3600 / 15; i++)
        {
            var t = start.AddSeconds(15 * i);
            foreach (var s in rvr)
            {
                yield return ReceivedReading.Accept(new Reading(t, s, ReadingKind.Rvr, Math.Round(1950 + (random.NextDouble() * 50)), ReadingStatus.Ok), t, "bench");
            }
            foreach (var c in ceilo)
            {
                yield return ReceivedReading.Accept(new Reading(t, c, ReadingKind.CloudBase, Math.Round(1480 + (random.NextDouble() * 40)), ReadingStatus.Ok), t, "bench");
            }
        }
        foreach (var r in night)
        {
            yield return ReceivedReading.Accept(r, r.Time, "bench");
        }
    }

    /// <summary>
    /// The benchmark file's bulk fill: <see cref="RowsPerInsert"/> rows per prepared INSERT, one transaction per
    /// <see cref="Chunk"/> rows, and <c>synchronous=OFF</c> with a 256 MiB page cache for this one connection only
    /// (WAL kept). A crash of the fill would only lose the benchmark's throwaway file. At the end the WAL is
    /// checkpointed and the app's settings (<c>journal_mode=WAL</c>, <c>synchronous=FULL</c>) read back before the app
    /// is started, which sets them on every connection it opens anyway (SqlitePragmaInterceptor).
    /// </summary>
    private static long InsertSqlite(string file, IEnumerable<ReceivedReading> readings)
    {
        using var connection = new SqliteConnection($"Data Source={file};Pooling=false");
        connection.Open();
        Exec(connection, "PRAGMA journal_mode=WAL; PRAGMA synchronous=OFF; PRAGMA cache_size=-262144;");
        const string columns = "INSERT INTO readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) VALUES ";
        SqliteCommand Prepare(int count)
        {
            var command = connection.CreateCommand();
            command.CommandText = columns + string.Join(", ", Enumerable.Range(0, count).Select(i =>
                string.Create(CultureInfo.InvariantCulture, $"($t{i}, $r{i}, $s{i}, $n{i}, $k{i}, $v{i}, $st{i}, 1, NULL, NULL)"))) + ";";
            for (var i = 0; i < count * 7; i++)
            {
                command.Parameters.Add(new SqliteParameter { ParameterName = string.Create(CultureInfo.InvariantCulture, $"${new[] { "t", "r", "s", "n", "k", "v", "st" }[i % 7]}{i / 7}") });
            }
            command.Prepare();
            return command;
        }
        using var many = Prepare(RowsPerInsert);
        using var one = Prepare(1);
        long rows = 0;
        SqliteTransaction? transaction = null;
        var pending = new List<ReceivedReading>(RowsPerInsert);
        void Write(SqliteCommand command, IReadOnlyList<ReceivedReading> batch)
        {
            command.Transaction = transaction;
            for (var j = 0; j < batch.Count; j++)
            {
                var r = batch[j];
                var p = command.Parameters;
                p[(j * 7) + 0].Value = AuditCanonical.FormatTime(r.Time!.Value);
                p[(j * 7) + 1].Value = AuditCanonical.FormatTime(r.ReceivedAt);
                p[(j * 7) + 2].Value = r.Source;
                p[(j * 7) + 3].Value = r.Sensor;
                p[(j * 7) + 4].Value = r.Kind;
                p[(j * 7) + 5].Value = r.Value!.Value;
                p[(j * 7) + 6].Value = r.Status;
            }
            command.ExecuteNonQuery();
        }
        foreach (var r in readings)
        {
            transaction ??= connection.BeginTransaction();
            pending.Add(r);
            if (pending.Count == RowsPerInsert)
            {
                Write(many, pending);
                pending.Clear();
            }
            if (++rows % Chunk == 0)
            {
                foreach (var rest in pending)
                {
                    Write(one, [rest]);
                }
                pending.Clear();
                transaction.Commit();
                transaction.Dispose();
                transaction = null;
                if (rows % (Chunk * 5) == 0)
                {
                    Progress(string.Create(CultureInfo.InvariantCulture, $"SQLite: {rows:N0} rows"));
                }
            }
        }
        if (pending.Count > 0)
        {
            transaction ??= connection.BeginTransaction();
            foreach (var rest in pending)
            {
                Write(one, [rest]);
            }
        }
        transaction?.Commit();
        transaction?.Dispose();
        Exec(connection, "PRAGMA wal_checkpoint(TRUNCATE); PRAGMA journal_mode=WAL; PRAGMA synchronous=FULL;");
        using (var check = connection.CreateCommand())
        {
            check.CommandText = "PRAGMA journal_mode;";
            var mode = Convert.ToString(check.ExecuteScalar(), CultureInfo.InvariantCulture);
            if (!string.Equals(mode, "wal", StringComparison.OrdinalIgnoreCase))
            {
                throw new InvalidOperationException($"the filled SQLite file is in journal_mode '{mode}', not WAL");
            }
        }
        return rows;
    }

    private static void Exec(SqliteConnection connection, string sql)
    {
        using var command = connection.CreateCommand();
        command.CommandText = sql;
        command.ExecuteNonQuery();
    }

    /// <summary>
    /// Binary COPY in one transaction, with the cluster's <c>max_wal_size</c> raised to 8 GB for the fill only (fewer
    /// checkpoints while the 23 million rows are written; reset and reloaded afterwards); <c>fsync</c> and
    /// <c>synchronous_commit</c> stay at their defaults. Then <c>ANALYZE</c>, as an installation's autovacuum would.
    /// </summary>
    private static async Task<long> CopyPostgresAsync(string connectionString, IEnumerable<ReceivedReading> readings)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync();
        await using (var wal = new NpgsqlCommand("ALTER SYSTEM SET max_wal_size = '8GB'; SELECT pg_reload_conf();", connection))
        {
            await wal.ExecuteNonQueryAsync();
        }
        long rows = 0;
        try
        {
            // synchronous writes: per-field async calls cost more than the copy itself here (nothing else runs on this connection)
            using var copy = connection.BeginBinaryImport(
                "COPY readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) FROM STDIN (FORMAT BINARY)");
            foreach (var r in readings)
            {
                copy.StartRow();
                copy.Write(AuditCanonical.FormatTime(r.Time!.Value), NpgsqlDbType.Text);
                copy.Write(AuditCanonical.FormatTime(r.ReceivedAt), NpgsqlDbType.Text);
                copy.Write(r.Source, NpgsqlDbType.Text);
                copy.Write(r.Sensor, NpgsqlDbType.Text);
                copy.Write(r.Kind, NpgsqlDbType.Text);
                copy.Write(r.Value!.Value, NpgsqlDbType.Double);
                copy.Write(r.Status!, NpgsqlDbType.Text);
                copy.Write(true, NpgsqlDbType.Boolean);
                copy.WriteNull();
                copy.WriteNull();
                if (++rows % (Chunk * 5) == 0)
                {
                    Progress(string.Create(CultureInfo.InvariantCulture, $"PostgreSQL: {rows:N0} rows"));
                }
            }
            copy.Complete();
        }
        finally
        {
            await using var reset = new NpgsqlCommand("ALTER SYSTEM RESET max_wal_size; SELECT pg_reload_conf();", connection);
            await reset.ExecuteNonQueryAsync();
        }
        await using (var analyze = new NpgsqlCommand("ANALYZE readings", connection))
        {
            await analyze.ExecuteNonQueryAsync();
        }
        return rows;
    }

    private static long SqliteSize(string file) =>
        new[] { file, file + "-wal", file + "-shm" }.Where(File.Exists).Sum(f => new FileInfo(f).Length);

    private static async Task<long> PostgresSizeAsync(string connectionString)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT pg_database_size(current_database())", connection);
        return (long)(await command.ExecuteScalarAsync())!;
    }

    private static string Seconds(TimeSpan t) => t.TotalSeconds.ToString("0.0 's'", CultureInfo.InvariantCulture);

    private static string Millis(TimeSpan t) => t.TotalMilliseconds.ToString("0 'ms'", CultureInfo.InvariantCulture);

    private static string Megabytes(long bytes) => (bytes / 1048576.0).ToString("0 'MB'", CultureInfo.InvariantCulture);
}
