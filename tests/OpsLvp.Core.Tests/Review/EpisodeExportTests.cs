using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Review;

namespace OpsLvp.Core.Tests.Review;

public sealed class EpisodeExportTests
{
    private static readonly ReviewFixtures Night = ReviewFixtures.DemoNight;

    [Fact]
    public void DemoNight_HasOneFinishedEpisode_WithTheRecordedTransitionTimes()
    {
        // Expected times: `opslvp replay` on the invented demo night (seed-demo/README.md, after RVR derivation).
        var episode = Assert.Single(Night.Episodes);
        Assert.Equal(
            ["20:37:06 normal>preparation", "21:42:06 preparation>active", "00:44:00 active>cancellation", "01:25:00 cancellation>normal"],
            episode.Transitions.Select(t => $"{t.At:HH:mm:ss} {Name(t.From)}>{Name(t.To)}"));
        Assert.Equal(Phase.Active, episode.DeepestPhase);
        Assert.NotNull(episode.End);
    }

    [Fact]
    public void Export_ReimportedAndReplayed_GivesTheRecordedTransitions()
    {
        var json = Night.Export().ToJson();
        var back = EpisodeExport.Parse(json);

        var replayed = back.Replay().Events.OfType<PhaseTransition>()
            .Select(t => (t.At, t.From, t.To, t.By, t.Actor)).ToList();
        var recorded = Night.Episodes[0].Transitions
            .Select(t => (t.At, t.From, t.To, By: t.By == "auto" ? TransitionBy.Auto : TransitionBy.Manual, t.Actor)).ToList();

        Assert.Equal(recorded, replayed);
        Assert.Equal(Night.Profile.Version, back.Profile.Version);
        Assert.Equal(Night.Profile.Thresholds, back.Profile.Thresholds);
    }

    [Fact]
    public void Export_KeepsTheEpisodesTicksAsActions()
    {
        var export = EpisodeExport.Parse(Night.Export().ToJson());

        var ticks = export.Actions.Where(a => a.Action == "tick").ToList();
        // The demo actions file ticks k.marlow's prep-rvr-check at 20:40 (seed-demo/scenarios/demo-night.actions.csv, invented).
        Assert.Contains(ticks, a => a.Target == "prep-rvr-check" && a.Actor == "k.marlow" && a.Value == "airside-ops" && a.Time.ToString("HH:mm") == "20:40");
        Assert.Equal(Night.Events.Count(e => e.Name == "item_ticked" && e.At >= export.Start && e.At <= export.End), ticks.Count);
    }

    [Fact]
    public void ExportedAudit_Unchanged_Verifies()
    {
        var export = EpisodeExport.Parse(Night.Export().ToJson());

        var result = export.VerifyAudit();

        Assert.True(result.Ok, result.Detail);
        Assert.True(export.Audit.Count > 10);
        Assert.Equal(export.Audit.Count, result.Entries);
    }

    [Fact]
    public void ExportedAudit_OneByteChanged_IsCaughtNamingTheEntry()
    {
        var export = Night.Export();
        var target = export.Audit[export.Audit.Count / 2];
        var json = export.ToJson();
        // Change one byte of that entry's payload: the actor field inside the payload text.
        var marker = $"\"sequence\": {target.Sequence},";
        var at = json.IndexOf(marker, StringComparison.Ordinal);
        Assert.True(at > 0);
        var payloadAt = json.IndexOf("\"payload_json\": \"{", at, StringComparison.Ordinal) + "\"payload_json\": \"{".Length + 2;
        var tampered = json[..payloadAt] + (json[payloadAt] == 'x' ? 'y' : 'x') + json[(payloadAt + 1)..];

        var result = EpisodeExport.Parse(tampered).VerifyAudit();

        Assert.False(result.Ok);
        Assert.Equal(AuditFailure.HashMismatch, result.Failure);
        Assert.Equal(target.Sequence, result.FirstBadSequence);
        Assert.Contains($"entry {target.Sequence}", result.Detail, StringComparison.Ordinal);
    }

    [Fact]
    public void ExportedAudit_EntryRemoved_IsASequenceGapAtTheMissingNumber()
    {
        var export = Night.Export();
        var removed = export.Audit[3];
        var cut = export with { Audit = export.Audit.Where(a => a.Sequence != removed.Sequence).ToList() };

        var result = EpisodeExport.Parse(cut.ToJson()).VerifyAudit();

        Assert.Equal(AuditFailure.SequenceGap, result.Failure);
        Assert.Equal(removed.Sequence, result.FirstBadSequence);
    }

    [Fact]
    public void Parse_WrongFormat_SaysWhatIsWrong()
    {
        var ex = Assert.Throws<FormatException>(() => EpisodeExport.Parse("{\"format\":\"something-else\"}"));
        Assert.Contains("opslvp.episode.v1", ex.Message, StringComparison.Ordinal);
        var bad = Night.Export().ToJson().Replace("\"kind\": \"rvr\"", "\"kind\": \"fog\"", StringComparison.Ordinal);
        var ex2 = Assert.Throws<FormatException>(() => EpisodeExport.Parse(bad));
        Assert.Contains("unknown kind 'fog'", ex2.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ReadingsCsv_RoundTripsThroughTheReplayParser()
    {
        var export = Night.Export();

        var csv = ReviewCsv.Readings(export.Readings);
        var back = ReadingsCsv.Parse(csv, "export.csv");

        Assert.Equal(export.Readings, back);
    }

    [Fact]
    public void AuditCsv_HasOneLinePerEntry_WithPayloadQuoted()
    {
        var export = Night.Export();

        var lines = ReviewCsv.Audit(export.Audit).TrimEnd('\n').Split('\n');

        Assert.Equal(ReviewCsv.AuditHeader, lines[0]);
        Assert.Equal(export.Audit.Count + 1, lines.Length);
        var first = export.Audit[0];
        Assert.StartsWith($"{first.Sequence},{AuditCanonical.FormatTime(first.Time)},", lines[1], StringComparison.Ordinal);
        Assert.EndsWith($",{first.PreviousHash},{first.Hash}", lines[1], StringComparison.Ordinal);
        Assert.Contains("\"{\"\"event\"\":", lines[1], StringComparison.Ordinal);
    }

    private static string Name(Phase p) => p.ToString().ToLowerInvariant();
}
