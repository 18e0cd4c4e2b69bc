using System.Diagnostics;
using System.Globalization;
using System.Runtime.InteropServices;
using BenchmarkDotNet.Running;
using OpsLvp.Benchmarks.Audit;
using OpsLvp.Benchmarks.Engine;
using OpsLvp.Benchmarks.Reporting;

namespace OpsLvp.Benchmarks;

/// <summary>OpsLvp benchmarks (docs/benchmarks.md). Not a test project: CI builds it and never runs it.</summary>
public static class BenchmarksProgram
{
    public static async Task<int> Main(string[] args)
    {
        // Since .NET 10 a termination signal ends the process at once, without AppDomain.ProcessExit
        // (learn.microsoft.com, "core-libraries/10.0/sigterm-signal-handler"): make it a normal exit, so what the run
        // started (the throwaway PostgreSQL cluster, redis-server, push-ha's child processes) is stopped at ProcessExit.
        using var term = PosixSignalRegistration.Create(PosixSignal.SIGTERM, _ => Environment.Exit(143));
        using var interrupt = PosixSignalRegistration.Create(PosixSignal.SIGINT, _ => Environment.Exit(130));
        using var hangUp = PosixSignalRegistration.Create(PosixSignal.SIGHUP, _ => Environment.Exit(129));
        if (args.SequenceEqual(OpsLvp.Benchmarks.Live.ProbeProcess.RoleArguments))
        {
            return await OpsLvp.Benchmarks.Live.ProbeProcess.RunChildAsync();
        }
        if (args.SequenceEqual(OpsLvp.Benchmarks.Live.NodeProcess.RoleArguments))
        {
            return await OpsLvp.Benchmarks.Live.NodeProcess.RunChildAsync();
        }
        BenchOptions options;
        try
        {
            options = BenchOptions.Parse(args);
        }
        catch (ArgumentException ex)
        {
            Console.Error.WriteLine($"opslvp-benchmarks: {ex.Message}");
            return 2;
        }

        var clock = Stopwatch.StartNew();
        var book = new ResultsBook(options);
        var config = BenchConfig.Create(options);
        string Command(string suite) => $"dotnet run -c Release --project tests/OpsLvp.Benchmarks --{(options.Quick ? " --quick" : "")} --only {suite}";
        string Verdict(bool met, string target, string detail) => $"{(met ? "met" : "MISSED")}: {target}{detail}";

        if (options.Runs("engine"))
        {
            var evaluate = BenchmarkRunner.Run<EvaluateBenchmarks>(config);
            book.AddSummary("Engine: one evaluation (demo profile, LVP episode)", evaluate, Command("engine"), (name, mean) =>
                name.StartsWith("Evaluate, 11", StringComparison.Ordinal) ? Verdict(mean < 50_000, "< 50 µs", string.Create(CultureInfo.InvariantCulture, $" ({mean / 50_000:0.00} of it)")) : null);
            book.Note($"Engine evaluation state: phase {EvaluateBenchmarks.WarmPhase} after 3 h of the generated fog night (9 RVR sensors, 2 ceilometers, seed {BenchData.Seed}).");

            // Each replay operation takes seconds: in quick mode no warm-up iterations and two measured ones (the jitting run warms up).
            var replay = BenchmarkRunner.Run<ReplayBenchmarks>(options.Quick ? BenchConfig.Create(options, warmups: 0, iterations: 2) : config);
            book.AddSummary("Engine: replay of 24 h (15 s readings, 9 RVR + 2 ceilometers)", replay, Command("engine"), (name, mean) =>
                name.StartsWith("ReplayRunner", StringComparison.Ordinal) ? Verdict(mean < 1e9, "well under 1 s", string.Create(CultureInfo.InvariantCulture, $" ({ReplayBenchmarks.ReadingCount} readings, {ReplayBenchmarks.ReadingCount / (mean / 1e9):0} readings/s)")) : null);

            var metar = BenchmarkRunner.Run<MetarBenchmarks>(config);
            book.AddSummary("Engine: METAR decoding (per report)", metar, Command("engine"), (name, mean) =>
                name.StartsWith("MetarDecoder", StringComparison.Ordinal) ? string.Create(CultureInfo.InvariantCulture, $"{1e9 / mean:0} decodes/s (no target set)") : null);
        }

        if (options.Runs("audit"))
        {
            if (options.DataDir is not null)
            {
                AuditAppendBenchmarks.DataDir = options.DataDir;
            }
            var audit = BenchmarkRunner.Run<AuditAppendBenchmarks>(config);
            book.AddSummary("Audit append vs raw SQLite (WAL; one transaction per operation)", audit, Command("audit"));
            foreach (var batch in new[] { 1, 10, 100 })
            {
                foreach (var sync in new[] { SyncMode.Full, SyncMode.Normal })
                {
                    if (ResultsBook.Mean(audit, nameof(AuditAppendBenchmarks.Ours), ("Sync", sync), ("Batch", batch)) is { } ours
                        && ResultsBook.Mean(audit, nameof(AuditAppendBenchmarks.RawInsert), ("Sync", sync), ("Batch", batch)) is { } raw)
                    {
                        var ratio = ours / raw;
                        book.Add(new ResultRow("Audit: derived ratios", $"ours/raw, synchronous={sync.ToString().ToUpperInvariant()}, batch {batch}", ResultsBook.FormatTime(ours), ratio, "raw INSERT", null,
                            Verdict(ratio <= 2, "within 2× raw", ratio <= 2 ? "" : string.Create(CultureInfo.InvariantCulture, $" (by {ratio / 2:0.00}×)")), Command("audit")));
                    }
                }
                foreach (var method in new[] { nameof(AuditAppendBenchmarks.Ours), nameof(AuditAppendBenchmarks.RawInsert) })
                {
                    if (ResultsBook.Mean(audit, method, ("Sync", SyncMode.Full), ("Batch", batch)) is { } full
                        && ResultsBook.Mean(audit, method, ("Sync", SyncMode.Normal), ("Batch", batch)) is { } normal)
                    {
                        book.Add(new ResultRow("Audit: derived ratios", $"FULL/NORMAL, {(method == nameof(AuditAppendBenchmarks.Ours) ? "ours" : "raw")}, batch {batch}", ResultsBook.FormatTime(full), full / normal, "same with NORMAL", null, null, Command("audit")));
                    }
                }
            }
            var overhead = BenchmarkRunner.Run<AuditOverheadBenchmarks>(config);
            book.AddSummary("Audit: what an append does besides the INSERTs (FULL)", overhead, Command("audit"));
            book.Note($"Audit database files: {AuditAppendBenchmarks.DataDir} (same disk as the product's data folder would be unless --data-dir says otherwise).");
        }

        if (options.Runs("pg-audit"))
        {
            // issue 16: the PostgreSQL hot path against raw Npgsql, on a throwaway cluster this process starts
            if (OpsLvp.Benchmarks.Services.BenchPostgres.FindBin() is null)
            {
                book.Note("pg-audit: not measured on this run: PostgreSQL server programs not found (apt install postgresql, or set OPSLVP_PG_BIN).");
            }
            else
            {
                var pg = BenchmarkRunner.Run<PostgresAuditBenchmarks>(config);
                book.AddSummary("Audit append on PostgreSQL vs raw Npgsql (one evaluation: 11 readings, then 1 entry)", pg, Command("pg-audit"));
                if (ResultsBook.Mean(pg, nameof(PostgresAuditBenchmarks.Ours)) is { } ours && ResultsBook.Mean(pg, nameof(PostgresAuditBenchmarks.RawInsert)) is { } raw)
                {
                    var ratio = ours / raw;
                    book.Add(new ResultRow("Audit: derived ratios", "ours/raw on PostgreSQL, 11 readings + 1 entry", ResultsBook.FormatTime(ours), ratio, "raw Npgsql INSERTs", null,
                        Verdict(ratio <= 2, "within 2× raw", ratio <= 2 ? "" : string.Create(CultureInfo.InvariantCulture, $" (by {ratio / 2:0.00}×)")), Command("pg-audit")));
                }
            }
        }

        if (options.Runs("anchors"))
        {
            if (options.DataDir is not null)
            {
                AuditAppendBenchmarks.DataDir = options.DataDir;
            }
            // issue 12: the signed chain head and the sealed state row, against a plain append
            var anchors = BenchmarkRunner.Run<AnchorCostBenchmarks>(config);
            book.AddSummary("Tamper evidence: sealed state row and signed chain head vs a plain append (SQLite, FULL)", anchors, Command("anchors"));
        }

        if (options.Runs("year"))
        {
            try
            {
                await OpsLvp.Benchmarks.Year.YearHarness.RunAsync(options, book, $"dotnet run -c Release --project tests/OpsLvp.Benchmarks -- --only year --days {options.Days}");
            }
            catch (Exception ex) when (ex is TimeoutException or InvalidOperationException or HttpRequestException or System.Data.Common.DbException)
            {
                book.Note($"year: not measured on this run: {ex.GetType().Name}: {ex.Message.ReplaceLineEndings(" ")}");
            }
        }

        if (options.Runs("review"))
        {
            if (options.DataDir is not null)
            {
                AuditAppendBenchmarks.DataDir = options.DataDir;
            }
            // Each operation reads up to millions of rows: one warm-up and three measured iterations in both modes.
            OpsLvp.Benchmarks.Review.ReviewLoadBenchmarks.Days = options.Quick ? 3 : 14;
            var review = BenchmarkRunner.Run<OpsLvp.Benchmarks.Review.ReviewLoadBenchmarks>(BenchConfig.Create(options with { Quick = true }, warmups: 1, iterations: 3));
            book.AddSummary($"Review: what one request reads ({OpsLvp.Benchmarks.Review.ReviewLoadBenchmarks.Days} days of readings, one episode)", review, Command("review"), (name, _) =>
                name.StartsWith("StoreEpisodeSource", StringComparison.Ordinal) ? "no target set" : null);
            book.Note(string.Create(CultureInfo.InvariantCulture, $"Review: {OpsLvp.Benchmarks.Review.ReviewLoadBenchmarks.ReadingRows} reading rows ({OpsLvp.Benchmarks.Review.ReviewLoadBenchmarks.Days} days × 11 sensors × every 15 s), one LVP episode on the last night, audit entries from its replay."));
        }

        if (options.Runs("push"))
        {
            try
            {
                await OpsLvp.Benchmarks.Live.PushLatencyHarness.RunAsync(options, book, Command("push"));
            }
            catch (Exception ex) when (ex is TimeoutException or InvalidOperationException or HttpRequestException or Microsoft.Playwright.PlaywrightException)
            {
                book.Note($"push: not measured on this run: {ex.GetType().Name}: {ex.Message.ReplaceLineEndings(" ")}");
            }
        }

        if (options.Runs("push-ha"))
        {
            try
            {
                await OpsLvp.Benchmarks.Live.PushHaHarness.RunAsync(options, book, Command("push-ha") + options.PushHaArguments());
            }
            catch (Exception ex) when (ex is TimeoutException or InvalidOperationException or HttpRequestException or System.Data.Common.DbException)
            {
                book.Note($"push-ha: not measured on this run: {ex.GetType().Name}: {ex.Message.ReplaceLineEndings(" ")}");
            }
        }

        if (options.Runs("inbox"))
        {
            try
            {
                await OpsLvp.Benchmarks.Live.InboxHarness.RunAsync(options, book, Command("inbox"));
            }
            catch (Exception ex) when (ex is TimeoutException or InvalidOperationException or HttpRequestException or System.Data.Common.DbException)
            {
                book.Note($"inbox: not measured on this run: {ex.GetType().Name}: {ex.Message.ReplaceLineEndings(" ")}");
            }
        }

        if (options.Runs("circuits"))
        {
            try
            {
                await OpsLvp.Benchmarks.Circuits.CircuitMemoryHarness.RunAsync(options, book, Command("circuits"));
            }
            catch (Exception ex) when (ex is TimeoutException or InvalidOperationException or HttpRequestException or Microsoft.Playwright.PlaywrightException)
            {
                book.Note($"circuits: not measured on this run: {ex.GetType().Name}: {ex.Message.ReplaceLineEndings(" ")}");
            }
        }

        book.Note(string.Create(CultureInfo.InvariantCulture, $"Whole run took {clock.Elapsed.TotalSeconds:0} s{(options.Quick ? " (quick mode)" : "")}."));
        var markdown = book.ToMarkdown();
        var path = book.Write();
        Console.WriteLine();
        Console.WriteLine(markdown);
        Console.WriteLine($"Results written to {path}");
        return 0;
    }
}
