namespace OpsLvp.Web.Retention;

/// <summary>Configuration section <c>Retention</c>: pruning of raw readings with an export (docs/retention.md).</summary>
public sealed class RetentionOptions
{
    public const string SectionName = "Retention";

    /// <summary>Days raw readings are kept after receipt; 0 (the default) keeps everything. The audit log is always kept.</summary>
    public int ReadingsDays { get; set; }

    /// <summary>
    /// Folder the pruned readings are exported to; relative paths are under the content root. Empty: the data folder's
    /// path with <c>-exports</c> appended (beside it, not inside it).
    /// </summary>
    public string ExportFolder { get; set; } = "";

    /// <summary>Real time between pruning runs.</summary>
    public TimeSpan Interval { get; set; } = TimeSpan.FromHours(1);

    /// <summary>Ids deleted per statement.</summary>
    public int BatchSize { get; set; } = 10_000;

    /// <summary>At most this many readings exported and deleted per run (several runs catch up).</summary>
    public int MaxReadingsPerRun { get; set; } = 500_000;
}
