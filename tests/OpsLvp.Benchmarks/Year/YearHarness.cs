using System.Diagnostics;
using System.Globalization;
using System.Text.Json;
using Microsoft.Data.Sqlite;
using Npgsql;
using NpgsqlTypes;
using OpsLvp.Benchmarks.Engine;
using OpsLvp.Benchmarks.Live;
using OpsLvp.Benchmarks.Reporting;
using OpsLvp.Benchmarks.Services;
using OpsLvp.Core.Audit;
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
    private const int Chunk = 100_000;

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

            var fill = Stopwatch.StartNew();
            var rows = postgres
                ? await CopyPostgresAsync(connectionString, Readings(profile, start, options.Days - 1, night))
                : InsertSqlite(file, Readings(profile, start, options.Days - 1, night));
            fill.Stop();
            book.Add(new ResultRow(section, $"{name}: bulk insert of {rows:N0} rows", Seconds(fill.Elapsed), null, null, null,
                string.Create(CultureInfo.InvariantCulture, $"{rows / fill.Elapsed.TotalSeconds:N0} rows/s ({(postgres ? "binary COPY" : $"prepared INSERT, one transaction per {Chunk:N0} rows")})"), command));
            book.Add(new ResultRow(section, $"{name}: disk size", Megabytes(postgres ? await PostgresSizeAsync(connectionString) : SqliteSize(file)), null, null, null,
                postgres ? "pg_database_size" : "database file + WAL", command));

            var settings = new Dictionary<string, string?>
            {
                [OpsLvpDatabase.ProviderSetting] = provider,
                [postgres ? OpsLvpDatabase.PostgresConnectionStringSetting : OpsLvpDatabase.ConnectionStringSetting] = connectionString,
            };
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
                    throw new TimeoutException($"/health did not answer 200 within 10 minutes on {name}: {health}");
                }
                await Task.Delay(50);
            }
            startup.Stop();
            var status = JsonDocument.Parse(health).RootElement.TryGetProperty("status", out var s) ? s.GetString() : "?";
            book.Add(new ResultRow(section, $"{name}: app start to /health 200", Seconds(startup.Elapsed), null, null, null, $"status \"{status}\" (migrations checked, engine restored, no feed)", command));

            var source = new StoreEpisodeSource(server.Services);
            var review = Stopwatch.StartNew();
            var record = await source.LoadAsync();
            review.Stop();
            book.Add(new ResultRow(section, $"{name}: one review load (episode list + one episode)", Millis(review.Elapsed), null, null, null,
                string.Create(CultureInfo.InvariantCulture, $"StoreEpisodeSource.LoadAsync in the running app: {record.Readings.Count:N0} readings of the episode window"), command));

            var key = await server.IssuePushKeyAsync();
            using var request = new HttpRequestMessage(HttpMethod.Get, "/api/state");
            request.Headers.Add(ApiKeyAuthenticationHandler.Header, key);
            var stateClock = Stopwatch.StartNew();
            using var state = await http.SendAsync(request);
            var body = await state.Content.ReadAsByteArrayAsync();
            stateClock.Stop();
            book.Add(new ResultRow(section, $"{name}: GET /api/state", Millis(stateClock.Elapsed), null, null, null,
                string.Create(CultureInfo.InvariantCulture, $"HTTP {(int)state.StatusCode}, {body.Length:N0} bytes (first request, cold)"), command));
        }
        finally
        {
            SqliteConnection.ClearAllPools();
            NpgsqlConnection.ClearAllPools();
            BenchFiles.TryDeleteFolder(folder);
        }
    }

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

    private static long InsertSqlite(string file, IEnumerable<ReceivedReading> readings)
    {
        using var connection = new SqliteConnection($"Data Source={file};Pooling=false");
        connection.Open();
        using (var pragma = connection.CreateCommand())
        {
            pragma.CommandText = "PRAGMA journal_mode=WAL; PRAGMA synchronous=FULL;";
            pragma.ExecuteNonQuery();
        }
        using var insert = connection.CreateCommand();
        insert.CommandText = "INSERT INTO readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) VALUES ($t, $r, $s, $n, $k, $v, $st, 1, NULL, NULL);";
        var p = new[] { "$t", "$r", "$s", "$n", "$k", "$v", "$st" }.Select(n => insert.Parameters.Add(new SqliteParameter { ParameterName = n })).ToArray();
        insert.Prepare();
        long rows = 0;
        SqliteTransaction? transaction = null;
        foreach (var r in readings)
        {
            if (transaction is null)
            {
                transaction = connection.BeginTransaction();
                insert.Transaction = transaction;
            }
            p[0].Value = AuditCanonical.FormatTime(r.Time!.Value);
            p[1].Value = AuditCanonical.FormatTime(r.ReceivedAt);
            p[2].Value = r.Source;
            p[3].Value = r.Sensor;
            p[4].Value = r.Kind;
            p[5].Value = r.Value!.Value;
            p[6].Value = r.Status;
            insert.ExecuteNonQuery();
            if (++rows % Chunk == 0)
            {
                transaction.Commit();
                transaction.Dispose();
                transaction = null;
            }
        }
        transaction?.Commit();
        transaction?.Dispose();
        using (var checkpoint = connection.CreateCommand())
        {
            checkpoint.CommandText = "PRAGMA wal_checkpoint(TRUNCATE);";
            checkpoint.ExecuteNonQuery();
        }
        return rows;
    }

    private static async Task<long> CopyPostgresAsync(string connectionString, IEnumerable<ReceivedReading> readings)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync();
        long rows = 0;
        await using (var copy = await connection.BeginBinaryImportAsync(
            "COPY readings (time, received_at, source, sensor, kind, value, status, accepted, reject_reason, reject_detail) FROM STDIN (FORMAT BINARY)"))
        {
            foreach (var r in readings)
            {
                await copy.StartRowAsync();
                await copy.WriteAsync(AuditCanonical.FormatTime(r.Time!.Value), NpgsqlDbType.Text);
                await copy.WriteAsync(AuditCanonical.FormatTime(r.ReceivedAt), NpgsqlDbType.Text);
                await copy.WriteAsync(r.Source, NpgsqlDbType.Text);
                await copy.WriteAsync(r.Sensor, NpgsqlDbType.Text);
                await copy.WriteAsync(r.Kind, NpgsqlDbType.Text);
                await copy.WriteAsync(r.Value!.Value, NpgsqlDbType.Double);
                await copy.WriteAsync(r.Status!, NpgsqlDbType.Text);
                await copy.WriteAsync(true, NpgsqlDbType.Boolean);
                await copy.WriteNullAsync();
                await copy.WriteNullAsync();
                rows++;
            }
            await copy.CompleteAsync();
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
