using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Components.Pages.Wall;
using static OpsLvp.Web.Tests.Components.Wall.WallSnapshots;

namespace OpsLvp.Web.Tests.Components.Wall;

/// <summary>The wall's labels and budgets, computed without rendering. Snapshots are invented.</summary>
public sealed class WallViewModelTests
{
    [Theory]
    [InlineData(45, "45 s")]
    [InlineData(60, "1 min")]
    [InlineData(3599, "59 min 59 s")]
    [InlineData(3900, "1 h 05 min")]
    [InlineData(93600, "1 d 2 h")]
    [InlineData(-5, "0 s")]
    public void Duration_ReadsAtAGlance(int seconds, string expected) =>
        Assert.Equal(expected, WallViewModel.Duration(TimeSpan.FromSeconds(seconds)));

    [Fact]
    public void LocalTime_FollowsTheAerodromeTimeZone_IncludingSummerTime()
    {
        // Europe/Lisbon is UTC+0 in winter and UTC+1 in summer (IANA tz database, common practice).
        var winter = WallViewModel.Build(Snapshot(), At);
        var summer = WallViewModel.Build(Snapshot(), new DateTimeOffset(2026, 7, 1, 12, 0, 0, TimeSpan.Zero));

        Assert.Equal("22:00:00Z", winter.UtcTime);
        Assert.Equal("22:00:00", winter.LocalTime);
        Assert.Equal("12:00:00Z", summer.UtcTime);
        Assert.Equal("13:00:00", summer.LocalTime);
        Assert.Equal("local Europe/Lisbon", summer.LocalLabel);
    }

    [Fact]
    public void UnknownTimeZone_SaysSo_InsteadOfShowingAWrongTime()
    {
        var vm = WallViewModel.Build(Snapshot(timeZone: "Nowhere/Invented"), At);

        Assert.Equal("--:--:--", vm.LocalTime);
        Assert.Equal("local time zone 'Nowhere/Invented' unknown", vm.LocalLabel);
    }

    [Fact]
    public void Thresholds_ArePrintedFromTheSnapshot()
    {
        var vm = WallViewModel.Build(Snapshot(), At);

        // Demo profile's illustrative values (seed-demo/profile.json), invented.
        Assert.Equal(new WallThresholdRow("LVP preparation", "1000 m · 300 ft", "1200 m · 400 ft", "1 min / 15 min"), vm.Thresholds[0]);
        Assert.Equal(new WallThresholdRow("LVP in force", "550 m · 200 ft", "650 m · 250 ft", "30 s / 10 min"), vm.Thresholds[1]);
    }

    [Fact]
    public void WithoutCeilometer_TheCeilingIsLeftOut_AndUnknownRvrSaysUnknown()
    {
        var status = Status() with { CeilingConfigured = false, Ceiling = null, GoverningRvr = null };

        var vm = WallViewModel.Build(Snapshot(status), At);

        Assert.Null(vm.Ceiling);
        Assert.Equal("UNKNOWN", vm.GoverningRvr.ValueText);
        Assert.Equal("wall-fig-unknown", vm.GoverningRvr.CssClass);
    }

    [Fact]
    public void FlaggedGoverningRvr_SaysLuminanceUnknownAndOrMoreBesideTheValue()
    {
        // docs/engine.md R19 and R22: a value derived without luminance, and METAR's "RVR 1500 m or more" (invented values)
        var unknownLuminance = Status() with { GoverningRvr = Rvr(400, "rvr-tdz", "07L TDZ") with { Flags = ReadingFlags.LuminanceUnknown } };
        var vm = WallViewModel.Build(Snapshot(unknownLuminance), At);
        Assert.Equal("400 m", vm.GoverningRvr.ValueText);
        Assert.EndsWith("· luminance unknown", vm.GoverningRvr.Detail, StringComparison.Ordinal);

        var orMore = Status() with { GoverningRvr = Rvr(1500, "metar-07l", "07L TDZ") with { Flags = ReadingFlags.OrMore } };
        vm = WallViewModel.Build(Snapshot(orMore), At);
        Assert.Equal("≥ 1500 m", vm.GoverningRvr.ValueText);
        Assert.DoesNotContain("unknown", vm.GoverningRvr.Detail, StringComparison.Ordinal);
    }

    [Fact]
    public void ReadingAges_KeepCountingAfterTheSnapshot()
    {
        var vm = WallViewModel.Build(Snapshot(), At.AddSeconds(30));

        // Readings were 20 s old at the snapshot instant (invented).
        Assert.Equal("50 s old", vm.Runways[0].Positions[0].StateText);
    }

    [Fact]
    public void ManyOpenItems_StayWithinTheLineBudget_AndEveryTeamKeepsItsMostUrgentItem()
    {
        var items = Enumerable.Range(0, 30)
            .Select(i => Item($"i{i:00}", $"Invented action number {i:00}", $"Team {i % 5}", At.AddMinutes(i), overdue: false))
            .ToList();

        var vm = WallViewModel.Build(Snapshot(Status(Phase.Active), items: items), At);

        Assert.Equal(5, vm.Teams.Count);
        Assert.All(vm.Teams, t => Assert.NotEmpty(t.Items));
        Assert.Equal(30, vm.Teams.Sum(t => t.Items.Count + t.Hidden));
        var lines = vm.Teams.Sum(t => 1 + (t.Hidden > 0 ? 1 : 0) + t.Items.Sum(i => (i.Text.Length + WallViewModel.ItemCharsPerLine - 1) / WallViewModel.ItemCharsPerLine));
        Assert.InRange(lines, WallViewModel.ItemLineBudget - 2, WallViewModel.ItemLineBudget);
        Assert.Equal("i00", vm.Teams[0].Items[0].ItemId);
    }

    [Fact]
    public void ManyAlarms_ShowAtLeastOne_AndCountTheRest()
    {
        var alarms = Enumerable.Range(0, 6)
            .Select(i => new Alarm($"k{i}", AlarmKind.SensorSilent, $"invented sensor s{i} silent", At.AddMinutes(-i)))
            .ToList();
        var waiting = Enumerable.Range(0, 8)
            .Select(i => new WaitingFor(WaitKind.RecoveryBlocked, "recovery blocked: no fresh reading from an invented sensor", null, null, []))
            .ToList();

        var crowded = WallViewModel.Build(Snapshot(Status(Phase.Active) with { Alarms = alarms, Waiting = waiting }), At);
        var roomy = WallViewModel.Build(Snapshot(Status(Phase.Active) with { Alarms = alarms }), At);

        Assert.Single(crowded.Alarms);
        Assert.Equal(5, crowded.HiddenAlarms);
        Assert.Equal("k0", crowded.Alarms[0].Key);
        Assert.Equal(WallViewModel.MaxAlarms, roomy.Alarms.Count);
        Assert.Equal(6 - WallViewModel.MaxAlarms, roomy.HiddenAlarms);
    }

    [Fact]
    public void LongAlarms_AreHeadedByTheirKind_CutToThreeLines_AndBothShown()
    {
        // invented texts of the inbox alarms' length (docs/engine.md R81, R82): a database error named in full
        var error = string.Concat(Enumerable.Repeat("invented database error detail ", 12));
        var alarms = new[]
        {
            new Alarm("inbox-batch-set-aside", AlarmKind.InboxBatchSetAside, "reading batch 1 received on node-b could not be evaluated and was set aside: " + error, At.AddMinutes(-1)),
            new Alarm("inbox-behind", AlarmKind.InboxBehind, "2 reading batch(es) pushed to other nodes wait for evaluation, the oldest received on node-b; the screens do not show those readings yet", At),
            new Alarm("k-short", AlarmKind.SensorSilent, "invented sensor silent", At.AddMinutes(-2)),
        };

        var vm = WallViewModel.Build(Snapshot(Status(Phase.Preparation) with { Alarms = alarms }), At);

        Assert.Equal(3, vm.Alarms.Count);
        Assert.Equal(0, vm.HiddenAlarms);
        var setAside = Assert.Single(vm.Alarms, a => a.Key == "inbox-batch-set-aside");
        Assert.Equal("Reading batch set aside", setAside.Label);
        Assert.True(setAside.Shortened);
        Assert.True(Assert.Single(vm.Alarms, a => a.Key == "inbox-behind").Shortened);
        Assert.False(Assert.Single(vm.Alarms, a => a.Key == "k-short").Shortened);
    }

    [Fact]
    public void WhenEveryPositionReadsTheSame_NoneIsMarkedLowest()
    {
        var runway = Runway07L(
            Fresh(Core.Profile.RvrPosition.Tdz, "rvr-07l-tdz", "07L TDZ", 2000),
            Fresh(Core.Profile.RvrPosition.Mid, "rvr-07l-mid", "07L MID", 2000),
            Fresh(Core.Profile.RvrPosition.End, "rvr-07l-end", "07L END", 2000));

        var vm = WallViewModel.Build(Snapshot(Status(runways: [runway])), At);

        Assert.DoesNotContain(vm.Runways[0].Positions, p => p.Lowest);
    }

    [Fact]
    public void SafeguardsIncompleteAndRelaxation_AreNotedBesideThePhase()
    {
        // docs/engine.md R13 and R15; people and items invented
        var status = Status(Phase.Preparation) with
        {
            ConditionsMetSafeguardsIncomplete = true,
            SafeguardsOutstanding = ["prep-works-stop"],
            RelaxedAgainstConditions = new Relaxation("r.vale", Phase.Active, Phase.Cancellation, At.AddMinutes(-5), "test"),
        };
        var vm = WallViewModel.Build(Snapshot(status), At);
        Assert.Equal("LVP conditions met — safeguards incomplete: prep-works-stop open", vm.PhaseNotes[0]);
        Assert.StartsWith("relaxed by r.vale against conditions", vm.PhaseNotes[1], StringComparison.Ordinal);
        Assert.Empty(WallViewModel.Build(Snapshot(Status(Phase.Preparation)), At).PhaseNotes);
    }
}
