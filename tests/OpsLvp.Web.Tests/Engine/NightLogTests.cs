using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>
/// The server log tells the night (issue 13): the real app, real pushed readings and real commands, the log captured
/// through a logger provider added to the app's own logger factory. Profile, readings, people and reasons invented.
/// </summary>
public sealed class NightLogTests
{
    /// <summary>Audit entry kind → the words its log line carries after the timestamp.</summary>
    private static readonly Dictionary<string, string> s_lineWords = new(StringComparer.Ordinal)
    {
        ["transition"] = "phase: ",
        ["proposal"] = "proposed: ",
        ["proposal_withdrawn"] = "proposal withdrawn: ",
        ["confirmation"] = "confirmed: ",
        ["manual_action"] = "manual action by ",
        ["alarm_raised"] = "alarm raised: ",
        ["alarm_cleared"] = "alarm cleared: ",
        ["alarm_acknowledged"] = "alarm acknowledged: ",
        ["item_ticked"] = "item ",
        ["feed_lost"] = "feed ",
        ["feed_restored"] = "feed ",
        ["feed_degraded"] = "feed ",
        ["feed_flapped"] = "feed ",
    };

    private static CommandCaller Caller(string name, string role, params string[] teams) => new(name, new HashSet<string> { role }, teams.ToHashSet(), true);

    [Fact]
    public async Task EveryTransitionProposalConfirmationWithdrawalManualActionTickAndAlarm_IsOneInformationLine_InTheVocabularysWords()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            // preparation -> active needs confirmation here (docs/engine.md R10), so proposals, withdrawals and confirmations happen
            var profile = LiveTestProfile.Write(folder);
            File.WriteAllText(profile, File.ReadAllText(profile).Replace("\"confirm\": []", "\"confirm\": [ { \"from\": \"preparation\", \"to\": \"active\" } ]", StringComparison.Ordinal));
            var settings = LiveTestProfile.Settings(profile);
            settings["Logging:LogLevel:" + NightLog.Category] = "Information";
            await using var app = OpsLvpApp.Start(settings, folder);
            using var log = new CapturingLoggerProvider();
            app.Services.GetRequiredService<ILoggerFactory>().AddProvider(log);
            var from = (await LiveClient.Audit(app).GetHeadAsync())?.Sequence ?? 0;
            var commands = app.Services.GetRequiredService<ILvpCommandService>();
            var manager = Caller("dm.night", Roles.DutyManager);

            // 900 m < 1000 m: preparation; 500 m < 550 m: proposal of active; 800 m: the condition stops holding, withdrawn
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 900));
            await LiveClient.WaitForPhaseAsync(app, "preparation");
            Assert.Equal(CommandOutcomeKind.Applied, (await commands.ExecuteAsync(Caller("g.night", Roles.GroundStaff, LiveTestProfile.Team), new TickItem("x", LiveTestProfile.Team, "tp-1"))).Kind);
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 500));
            await WaitForAsync(app, "proposal", 1);
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 800));
            await WaitForAsync(app, "proposal_withdrawn", 1);
            // proposed again, the pending alarm acknowledged, then confirmed: active
            await LiveClient.PushAsync(app, LiveClient.Item(DateTimeOffset.UtcNow, LiveTestProfile.Tdz, "rvr", 500));
            await WaitForAsync(app, "proposal", 2);
            Assert.Equal(CommandOutcomeKind.Applied, (await commands.ExecuteAsync(manager, new AcknowledgeAlarm("x", AlarmKeys.Pending))).Kind);
            Assert.Equal(CommandOutcomeKind.Applied, (await commands.ExecuteAsync(manager, new ConfirmPending("x", "fog thickening (invented)"))).Kind);
            await LiveClient.WaitForPhaseAsync(app, "active");
            Assert.Equal(CommandOutcomeKind.Applied, (await commands.ExecuteAsync(manager, new SetSensorService("x", LiveTestProfile.Tdz, false, "lamp change (invented)"))).Kind);

            var entries = (await LiveClient.EntriesAsync(app)).Where(e => e.Sequence > from && s_lineWords.ContainsKey(e.Kind)).ToList();
            var night = log.Lines.Where(l => l.Category == NightLog.Category).ToList();
            foreach (var kind in new[] { "transition", "proposal", "proposal_withdrawn", "confirmation", "manual_action", "alarm_raised", "alarm_cleared", "alarm_acknowledged", "item_ticked" })
            {
                Assert.Contains(entries, e => e.Kind == kind);
            }
            // one line per event: for each instant and kind, as many lines as audit entries
            foreach (var group in entries.GroupBy(e => (Time: DisplayFormat.UtcDateTime(e.Time), e.Kind)))
            {
                var prefix = $"{group.Key.Time} {s_lineWords[group.Key.Kind]}";
                var lines = night.Count(l => l.Message.StartsWith(prefix, StringComparison.Ordinal)
                    && (group.Key.Kind == "item_ticked" ? l.Message.Contains(" done by ", StringComparison.Ordinal) : true));
                Assert.True(group.Count() == lines, $"{group.Count()} {group.Key.Kind} entr(y/ies) at {group.Key.Time} but {lines} log line(s): {string.Join(" | ", night.Select(l => l.Message))}");
            }
            Assert.True(entries.Count == night.Count, $"{entries.Count} entries, {night.Count} lines: {string.Join(" | ", night.Select(l => l.Message))}");
            Assert.All(night, l => Assert.Equal(LogLevel.Information, l.Level));
            Assert.All(night, l => Assert.DoesNotContain("->", l.Message, StringComparison.Ordinal));
            Assert.Contains(night, l => l.Message.Contains($"phase: {LvpVocabulary.Change(Phase.Normal, Phase.Preparation)} (on the conditions)", StringComparison.Ordinal));
            Assert.Contains(night, l => l.Message.Contains($"confirmed: {LvpVocabulary.Change(Phase.Preparation, Phase.Active)} by dm.night", StringComparison.Ordinal));
            Assert.Contains(night, l => l.Message.Contains("item tp-1 done by g.night", StringComparison.Ordinal));
            Assert.Contains(night, l => l.Message.Contains("alarm acknowledged: Confirm phase change (pending) by dm.night", StringComparison.Ordinal));
            // SQL stays at Warning while the night's lines are at Information
            Assert.DoesNotContain(log.Lines, l => l.Category.StartsWith("Microsoft.EntityFrameworkCore", StringComparison.Ordinal) && l.Level < LogLevel.Warning);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public void FeedChangeOnRecord_IsOneLine_NamingTheFeedAndItsStatus()
    {
        var journal = new FeedHealthJournal(TimeSpan.FromMinutes(5));
        var t0 = new DateTimeOffset(2026, 1, 15, 2, 0, 0, TimeSpan.Zero);
        journal.Observe([Health("rvr-push", FeedStatus.Ok)], t0, t0);
        var change = Assert.Single(journal.Observe([Health("rvr-push", FeedStatus.Down)], t0.AddSeconds(30), t0.AddSeconds(30)));

        Assert.Equal("2026-01-15 02:00:30Z feed rvr-push lost: now down (1 change since the last entry)", NightLog.FeedLine(change, t0.AddSeconds(30)));
    }

    [Fact]
    public void ReadingsAndBookkeeping_AreNotPartOfTheNightsAccount()
    {
        var t = new DateTimeOffset(2026, 1, 15, 2, 0, 0, TimeSpan.Zero);
        Assert.Null(NightLog.Line(new EpisodeStarted(t, "e1")));
        Assert.Null(NightLog.Line(new ChecklistOpened(t, Phase.Preparation, ["p-1"])));
        Assert.Equal(
            $"2026-01-15 02:00:00Z proposal withdrawn: {LvpVocabulary.Change(Phase.Preparation, Phase.Active)}, proposed 2026-01-15 01:59:00Z: superseded: {LvpVocabulary.Change(Phase.Preparation, Phase.Cancellation)} is due instead",
            NightLog.Line(new ProposalWithdrawn(t, Phase.Preparation, Phase.Active, t.AddMinutes(-1), "superseded: preparation -> cancellation is due instead")));
    }

    private static FeedHealth Health(string name, FeedStatus status) =>
        new(name, "push", status, null, null, null, 0, null, null, 0, 0, 0, 0, 0, null);

    private static async Task WaitForAsync(OpsLvpApp app, string kind, int count)
    {
        var until = DateTimeOffset.UtcNow.AddSeconds(60);
        while ((await LiveClient.EntriesAsync(app)).Count(e => e.Kind == kind) < count)
        {
            Assert.True(DateTimeOffset.UtcNow < until, $"no {count} '{kind}' audit entries within 60 s");
            await Task.Delay(100);
        }
    }
}
