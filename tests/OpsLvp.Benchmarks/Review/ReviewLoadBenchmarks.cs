using BenchmarkDotNet.Attributes;
using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Benchmarks.Audit;
using OpsLvp.Benchmarks.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Data;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Review;

namespace OpsLvp.Benchmarks.Review;

/// <summary>
/// What a review page request reads (<see cref="StoreEpisodeSource.LoadAsync"/>: the audit, the chain check, the
/// readings around the episodes) from a database holding <see cref="Days"/> days of 15-second readings from the 9 RVR
/// sensors and 2 ceilometers, with one LVP episode on the last night (invented, fixed seed). Baseline: reading only
/// that episode's window of readings. Beside it, reading the whole readings table, as the review did before it
/// read by episode window.
/// </summary>
[MemoryDiagnoser]
public class ReviewLoadBenchmarks
{
    /// <summary>Days of readings in the file (set by the program: fewer in quick mode).</summary>
    public static int Days { get; set; } = 14;

    public static int ReadingRows { get; private set; }

    private string _folder = "";
    private AuditStore _audit = null!;
    private ReadingStore _readings = null!;
    private StoreEpisodeSource _source = null!;
    private DateTimeOffset _from;
    private DateTimeOffset _to;

    [GlobalSetup]
    public void Setup()
    {
        _folder = Path.Combine(AuditAppendBenchmarks.DataDir, Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(_folder);
        var factory = new OpsLvpDbContextFactory(OpsLvpDatabase.SqliteOptions($"Data Source={Path.Combine(_folder, "review.db")}"));
        DatabaseStartup.MigrateAndCheckAsync(factory).GetAwaiter().GetResult();
        _audit = new AuditStore(factory);
        _readings = new ReadingStore(factory);
        var profile = BenchData.DemoProfile();

        var lastDay = BenchData.Start.AddDays(Days - 1);
        var night = BenchData.FogNight(profile, 24, lastDay);
        var events = ReplayRunner.Run(profile, night, []).Events;
        _audit.AppendAsync(events.Where(AuditEvents.IsAudited).Select(AuditEvents.ToEntry).ToList()).GetAwaiter().GetResult();

        var rows = 0;
        var batch = new List<ReceivedReading>(20_000);
        void Flush()
        {
            _readings.InsertAsync(batch).GetAwaiter().GetResult();
            rows += batch.Count;
            batch.Clear();
        }
        foreach (var r in FairDays(profile, BenchData.Start, Days - 1).Concat(night))
        {
            batch.Add(ReceivedReading.Accept(r, r.Time, "bench"));
            if (batch.Count == batch.Capacity)
            {
                Flush();
            }
        }
        Flush();
        ReadingRows = rows;

        var recorded = events.Select(RecordedEvent.FromEvent).ToList();
        // Exactly one episode, or the generated night is not what this measures.
        _ = EpisodeModel.Bounds(recorded).Single();
        (_from, _to) = StoreEpisodeSource.ReadingWindows(recorded, EpisodeExport.LeadIn(profile)).Single();
        _source = new StoreEpisodeSource(new ServiceCollection().AddSingleton(profile).AddSingleton(_audit).AddSingleton(_readings).BuildServiceProvider());
    }

    [Benchmark(Baseline = true, Description = "Readings of the episode's window only")]
    public async Task<int> WindowOnly() => (await _readings.GetReceivedAsync(_from, _to)).Count;

    [Benchmark(Description = "StoreEpisodeSource.LoadAsync (what a review request reads)")]
    public async Task<int> Load() => (await _source.LoadAsync()).Readings.Count;

    [Benchmark(Description = "Before: every reading in the table")]
    public async Task<int> WholeTable() => (await _readings.GetReceivedAsync(DateTimeOffset.UnixEpoch, DateTimeOffset.MaxValue)).Count;

    [GlobalCleanup]
    public void Cleanup()
    {
        _audit.Dispose();
        _readings.Dispose();
        SqliteConnection.ClearAllPools();
        BenchFiles.TryDeleteFolder(_folder);
    }

    /// <summary>Fair-weather days: every 15 s, RVR about 2000 m and cloud base about 1500 ft with noise (invented).</summary>
    private static IEnumerable<Reading> FairDays(AerodromeProfile profile, DateTimeOffset start, int days)
    {
        var rvr = BenchData.RvrSensors(profile);
        var ceilo = BenchData.Ceilometers(profile);
        var random = new Random(BenchData.Seed);
        for (var i = 0; i < days * 24 * 3600 / 15; i++)
        {
            var t = start.AddSeconds(15 * i);
            foreach (var s in rvr)
            {
                yield return new Reading(t, s, ReadingKind.Rvr, Math.Round(1950 + (random.NextDouble() * 50)), ReadingStatus.Ok);
            }
            foreach (var c in ceilo)
            {
                yield return new Reading(t, c, ReadingKind.CloudBase, Math.Round(1480 + (random.NextDouble() * 40)), ReadingStatus.Ok);
            }
        }
    }
}
