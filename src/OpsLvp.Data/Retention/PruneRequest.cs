namespace OpsLvp.Data.Retention;

/// <summary>
/// One pruning run's bounds: readings received before <see cref="Cutoff"/>, at most <see cref="MaxReadings"/> of them,
/// exported to <see cref="ExportFolder"/>, deleted in batches of <see cref="BatchSize"/> ids.
/// </summary>
public sealed record PruneRequest(DateTimeOffset Cutoff, string ExportFolder, int BatchSize = 10_000, int MaxReadings = 500_000);
