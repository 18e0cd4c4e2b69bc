using System.Text.Json;
using Microsoft.Extensions.Options;
using OpsLvp.Data.Retention;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Retention;

/// <summary>
/// Runs <see cref="ReadingsPruner"/> every <see cref="RetentionOptions.Interval"/> (real time) on the node that leads
/// (docs/retention.md). The cutoff is in the app's clock (demo time in demo mode), like the readings' receipt times.
/// A failed run deletes nothing and is logged as an error with its reason; the next run tries again.
/// </summary>
public sealed class ReadingsRetentionService(
    ReadingsPruner pruner,
    AuditStore audit,
    IOptions<RetentionOptions> options,
    RetentionFolder folder,
    ILeadership leadership,
    TimeProvider time,
    ILogger<ReadingsRetentionService> logger) : BackgroundService
{
    /// <summary>The outcome of the last run, or null before the first.</summary>
    public PruneOutcome? LastOutcome { get; private set; }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var o = options.Value;
        if (o.ReadingsDays <= 0)
        {
            return;
        }
        logger.LogInformation("Readings retention: readings older than {Days} day(s) are exported to {Folder} and pruned every {Interval}", o.ReadingsDays, folder.Path, o.Interval);
        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                if (leadership.IsLeader)
                {
                    await RunOnceAsync(stoppingToken);
                }
                await Task.Delay(o.Interval, stoppingToken);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                logger.LogError(ex, "Readings retention run failed; nothing of it was deleted unless its audit entry was committed");
                await Task.Delay(o.Interval, stoppingToken).ContinueWith(_ => { }, TaskScheduler.Default);
            }
        }
    }

    /// <summary>One pruning run now (also used by tests).</summary>
    public async Task<PruneOutcome> RunOnceAsync(CancellationToken cancellationToken)
    {
        var o = options.Value;
        DateTimeOffset? episodeStart;
        try
        {
            var persisted = await audit.GetLatestStateAsync(cancellationToken);
            episodeStart = persisted is null ? null : EngineStateJson.Deserialize(persisted.StateJson).Episode?.Start;
        }
        catch (JsonException ex)
        {
            LastOutcome = new PruneOutcome(null, null, 0, $"readings not pruned: the stored engine state cannot be read to find an open episode: {ex.Message}");
            logger.LogError("{Failure}", LastOutcome.Failure);
            return LastOutcome;
        }
        if (RetentionCutoff.Compute(time.GetUtcNow(), o.ReadingsDays, episodeStart) is not { } cutoff)
        {
            return LastOutcome = new PruneOutcome(null, null, 0, null);
        }
        var outcome = await pruner.RunAsync(new PruneRequest(cutoff, folder.Path, o.BatchSize, o.MaxReadingsPerRun), cancellationToken);
        LastOutcome = outcome;
        if (outcome.Failed)
        {
            logger.LogError("Readings retention: {Failure}", outcome.Failure);
        }
        else if (outcome.Pruned is { } p)
        {
            logger.LogInformation("Readings retention: pruned {Count} reading(s) with id {First}–{Last} received before {Cutoff} into {Files} export file(s); audit entry {Sequence}",
                p.Count, p.After + 1, p.To, p.Cutoff, p.Files.Count, outcome.AuditSequence);
        }
        return outcome;
    }
}
