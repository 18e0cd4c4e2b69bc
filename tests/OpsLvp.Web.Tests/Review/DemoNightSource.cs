using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Review;
using OpsLvp.Web.Review;

namespace OpsLvp.Web.Tests.Review;

/// <summary>
/// The invented demo night of seed-demo/ replayed and recorded in an audit chain the way a live host records engine
/// events (payload = the EventJson line), served to the review as its record.
/// </summary>
public sealed class DemoNightSource : IEpisodeSource
{
    private static readonly Lazy<ReviewRecord> Night = new(Build);

    /// <summary>When set, the audit entry with this sequence has its actor changed after hashing (tamper test).</summary>
    public long? TamperSequence { get; init; }

    public static ReviewRecord Record => Night.Value;

    public Task<ReviewRecord> LoadAsync(CancellationToken cancellationToken = default)
    {
        var record = Night.Value;
        if (TamperSequence is not { } seq)
        {
            return Task.FromResult(record);
        }
        var audit = record.Audit.Select(a => a.Sequence == seq ? a with { Actor = a.Actor + "!" } : a).ToList();
        return Task.FromResult(record with { Audit = audit, Chain = AuditChain.Verify(audit) });
    }

    private static ReviewRecord Build()
    {
        var seed = Path.Combine(RepoRoot(), "seed-demo");
        var profile = ProfileLoader.Load(Path.Combine(seed, "profile.json"));
        var readingsPath = Path.Combine(seed, "scenarios", "demo-night.csv");
        var actionsPath = Path.Combine(seed, "scenarios", "demo-night.actions.csv");
        var readings = ReadingsCsv.Parse(File.ReadAllText(readingsPath), readingsPath);
        var replay = ReplayRunner.Run(profile, readings, ActionsCsv.Parse(File.ReadAllText(actionsPath), actionsPath));
        var events = new List<RecordedEvent>();
        var audit = new List<AuditEntry>();
        AuditEntry? previous = null;
        foreach (var e in replay.Events.Select(RecordedEvent.FromEvent))
        {
            previous = AuditChain.Append(previous, e.At, e.Str("actor") ?? "engine", e.Name, e.Json);
            audit.Add(previous);
            events.Add(e with { Sequence = previous.Sequence });
        }
        return new ReviewRecord(profile, readings, events, audit, AuditChain.Verify(audit));
    }

    private static string RepoRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.sln")))
            {
                return dir.FullName;
            }
        }
        throw new InvalidOperationException("OpsLvp.sln not found above " + AppContext.BaseDirectory);
    }
}
