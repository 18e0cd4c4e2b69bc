using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Core.Review;
using OpsLvp.Core.Tests.Profile;

namespace OpsLvp.Core.Tests.Review;

/// <summary>
/// The invented demo night of seed-demo/ (XDMO "Demo Field (invented)") run through the replay, with every event
/// recorded in an audit chain the way a live host records it (payload = the event's EventJson line).
/// </summary>
public sealed class ReviewFixtures
{
    private static readonly Lazy<ReviewFixtures> DemoNightLazy = new(() => new ReviewFixtures());

    private ReviewFixtures()
    {
        var seed = Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo");
        Profile = ProfileLoader.Load(Path.Combine(seed, "profile.json"));
        var readingsPath = Path.Combine(seed, "scenarios", "demo-night.csv");
        var actionsPath = Path.Combine(seed, "scenarios", "demo-night.actions.csv");
        Readings = ReadingsCsv.Parse(File.ReadAllText(readingsPath), readingsPath);
        var actions = ActionsCsv.Parse(File.ReadAllText(actionsPath), actionsPath);
        var replay = ReplayRunner.Run(Profile, Readings, actions);
        Events = replay.Events.Select(RecordedEvent.FromEvent).ToList();
        var audit = new List<AuditEntry>();
        AuditEntry? previous = null;
        foreach (var e in Events)
        {
            previous = AuditChain.Append(previous, e.At, e.Str("actor") ?? "engine", e.Name, e.Json);
            audit.Add(previous);
        }
        Audit = audit;
        Episodes = EpisodeModel.Build(Events, ReviewReadings.WithDerivedRvr(Profile, Readings), Readings[^1].Time);
    }

    public static ReviewFixtures DemoNight => DemoNightLazy.Value;

    public AerodromeProfile Profile { get; }

    public IReadOnlyList<Reading> Readings { get; }

    public IReadOnlyList<RecordedEvent> Events { get; }

    public IReadOnlyList<AuditEntry> Audit { get; }

    public IReadOnlyList<EpisodeSummary> Episodes { get; }

    public EpisodeExport Export() => EpisodeExport.Create(Episodes[0], Profile, Readings, Events, Audit);
}
