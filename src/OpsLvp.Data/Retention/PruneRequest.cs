namespace OpsLvp.Data.Retention;

/// <summary>
/// One pruning run's bounds: readings received before <see cref="Cutoff"/>, at most <see cref="MaxReadings"/> of them,
/// exported to <see cref="ExportFolder"/>, deleted in batches of <see cref="BatchSize"/> ids. <see cref="Epoch"/>: the
/// leadership epoch the run's audit entry carries (docs/engine.md R71; checked on PostgreSQL only); null appends unfenced.
/// </summary>
public sealed record PruneRequest(DateTimeOffset Cutoff, string ExportFolder, int BatchSize = 10_000, int MaxReadings = 500_000, long? Epoch = null);
