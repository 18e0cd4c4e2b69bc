using OpsLvp.Core.Review;

namespace OpsLvp.Web.Review;

/// <summary>Episodes and their review figures from the record (read only: nothing here writes or changes the live profile).</summary>
public sealed class ReviewService(IEpisodeSource source, TimeProvider clock)
{
    /// <summary>Every episode in start order, newest last, with whether the chain verifies.</summary>
    public async Task<(IReadOnlyList<EpisodeSummary> Episodes, ReviewRecord Record)> ListAsync(CancellationToken cancellationToken = default)
    {
        var record = await source.LoadAsync(cancellationToken);
        var shown = record.Profile is null ? record.Readings : ReviewReadings.WithDerivedRvr(record.Profile, record.Readings);
        return (EpisodeModel.Build(record.Events, shown, clock.GetUtcNow()), record);
    }

    /// <summary>The episode with <paramref name="episodeId"/>, or null when there is none (or no profile is loaded).</summary>
    public async Task<EpisodeView?> GetAsync(string episodeId, CancellationToken cancellationToken = default)
    {
        var (episodes, record) = await ListAsync(cancellationToken);
        var summary = episodes.FirstOrDefault(e => e.Id == episodeId);
        if (summary is null || record.Profile is null)
        {
            return null;
        }
        var end = summary.End ?? clock.GetUtcNow();
        var events = EpisodeModel.Within(record.Events, summary.Start, summary.End);
        var performance = ChecklistPerformance.Compute(events, record.Profile, summary.Start, end);
        var export = EpisodeExport.Create(summary, record.Profile, record.Readings, record.Events, record.Audit);
        return new EpisodeView(summary, performance, export, record.Chain, export.VerifyAudit());
    }
}
