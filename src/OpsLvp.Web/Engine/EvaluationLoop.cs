using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The evaluation loop of the engine host (docs/engine.md R7): takes reading batches from the
/// <see cref="ReadingPipeline"/> (batches queued meanwhile go into the same evaluation, same order, one commit) and
/// ticks at least once a second, handing each to <c>evaluate</c>; nothing a feed sends may stop it.
/// </summary>
internal sealed class EvaluationLoop(ReadingPipeline pipeline, TimeSpan tickInterval, TimeProvider realClock, ILogger logger)
{
    private const int MaxBatchesPerEvaluation = 64;

    /// <summary>Runs the reading consumer and the tick until <paramref name="stoppingToken"/> is cancelled.</summary>
    public Task RunAsync(Func<IReadOnlyList<ReadingBatch>, CancellationToken, Task> evaluate, CancellationToken stoppingToken) =>
        Task.WhenAll(ConsumeReadingsAsync(evaluate, stoppingToken), TickAsync(evaluate, stoppingToken));

    private async Task ConsumeReadingsAsync(Func<IReadOnlyList<ReadingBatch>, CancellationToken, Task> evaluate, CancellationToken stoppingToken)
    {
        await Task.Yield();
        try
        {
            await foreach (var batch in pipeline.ReadAllAsync(stoppingToken))
            {
                // batches queued meanwhile are taken in the same evaluation (same order, one commit)
                var batches = new List<ReadingBatch> { batch };
                while (batches.Count < MaxBatchesPerEvaluation && pipeline.TryRead(out var more) && more is not null)
                {
                    batches.Add(more);
                }
                await GuardedAsync(evaluate, batches, stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task TickAsync(Func<IReadOnlyList<ReadingBatch>, CancellationToken, Task> evaluate, CancellationToken stoppingToken)
    {
        var interval = tickInterval;
        if (interval <= TimeSpan.Zero || interval > TimeSpan.FromSeconds(1))
        {
            interval = TimeSpan.FromSeconds(1);
        }
        using var timer = new PeriodicTimer(interval, realClock);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                await GuardedAsync(evaluate, [], stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task GuardedAsync(Func<IReadOnlyList<ReadingBatch>, CancellationToken, Task> evaluate, IReadOnlyList<ReadingBatch> batches, CancellationToken stoppingToken)
    {
        try
        {
            await evaluate(batches, stoppingToken);
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            throw;
        }
        catch (Exception ex)
        {
            // Nothing a feed sends may stop the engine loop.
            logger.LogError(ex, "Evaluation failed");
        }
    }
}
