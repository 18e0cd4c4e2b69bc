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

    /// <summary>The episode with <paramref name="episodeId"/>, or null when there is none (or no profile is recorded or loaded).</summary>
    public async Task<EpisodeView?> GetAsync(string episodeId, CancellationToken cancellationToken = default)
    {
        var (episodes, record) = await ListAsync(cancellationToken);
        var summary = episodes.FirstOrDefault(e => e.Id == episodeId);
        // Judged by the profile in force when the episode began (recorded at the engine's start), not today's.
        var profile = summary is null ? null : record.ProfileAt(summary.Start);
        if (summary is null || profile is null)
        {
            return null;
        }
        var end = summary.End ?? clock.GetUtcNow();
        var events = EpisodeModel.Within(record.Events, summary.Start, summary.End);
        var performance = ChecklistPerformance.Compute(events, profile, summary.Start, end);
        var export = EpisodeExport.Create(summary, profile, record.Readings, record.Events, record.Audit);
        return new EpisodeView(summary, performance, export, record.Chain, export.VerifyAudit());
    }
}
