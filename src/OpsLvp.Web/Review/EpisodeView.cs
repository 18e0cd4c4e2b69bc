using OpsLvp.Core.Audit;
using OpsLvp.Core.Review;

namespace OpsLvp.Web.Review;

/// <summary>One episode ready for the review page: summary, checklist figures, export and the integrity status.</summary>
/// <param name="Chain">Verification of the whole chain from genesis.</param>
/// <param name="Segment">Verification of the episode's own entries as a segment.</param>
public sealed record EpisodeView(
    EpisodeSummary Summary,
    ChecklistPerformance Performance,
    EpisodeExport Export,
    AuditVerification Chain,
    AuditVerification Segment)
{
    public bool Verifies => Chain.Ok && Segment.Ok;
}
