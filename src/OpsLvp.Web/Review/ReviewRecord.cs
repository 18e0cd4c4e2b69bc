using OpsLvp.Core.Audit;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;

namespace OpsLvp.Web.Review;

/// <summary>Everything recorded that the review reads: the profile, readings, engine events and audit entries.</summary>
/// <param name="Profile">The profile loaded now; null when none is loaded (the review then says so).</param>
/// <param name="Chain">Verification of the whole audit chain from genesis.</param>
/// <param name="Profiles">The profiles the engine recorded at its starts (<c>profile_loaded</c> entries), in time order; empty when none are recorded.</param>
public sealed record ReviewRecord(
    AerodromeProfile? Profile,
    IReadOnlyList<Reading> Readings,
    IReadOnlyList<RecordedEvent> Events,
    IReadOnlyList<AuditEntry> Audit,
    AuditVerification Chain,
    IReadOnlyList<(DateTimeOffset At, AerodromeProfile Profile)>? Profiles = null)
{
    /// <summary>
    /// The profile in force at <paramref name="at"/>: the last one recorded at or before it, else (nothing recorded
    /// that early, e.g. a record from before profiles were recorded) the profile loaded now.
    /// </summary>
    public AerodromeProfile? ProfileAt(DateTimeOffset at) =>
        Profiles?.LastOrDefault(p => p.At <= at).Profile ?? Profile;
}
