using OpsLvp.Core.Audit;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;

namespace OpsLvp.Web.Review;

/// <summary>Everything recorded that the review reads: the profile, readings, engine events and audit entries.</summary>
/// <param name="Profile">The profile the episodes ran under; null when none is loaded (the review then says so).</param>
/// <param name="Chain">Verification of the whole audit chain from genesis.</param>
public sealed record ReviewRecord(
    AerodromeProfile? Profile,
    IReadOnlyList<Reading> Readings,
    IReadOnlyList<RecordedEvent> Events,
    IReadOnlyList<AuditEntry> Audit,
    AuditVerification Chain);
