using OpsLvp.Web.Feeds.Demo;

namespace OpsLvp.Web.Tests.Feeds.Demo;

/// <summary><see cref="DemoForecastShift"/>: a demo forecast moved to the demo clock. TAF invented for the invented XDMO.</summary>
public sealed class DemoForecastShiftTests
{
    private const string Taf = "TAF AMD XDMO 152025Z 1520/1618 24003KT 6000 BR TEMPO 1521/1600 0400 FG VV002 FM160130 9999 NSW";
    private static readonly DateTimeOffset s_written = new(2026, 1, 15, 20, 30, 0, TimeSpan.Zero);

    [Fact]
    public void IssueTimeMovesToTheMinute_DayHourGroupsToTheNearestHour()
    {
        // demo clock 3 h 20 min ahead of the scenario: issue 2345Z, groups 3 h later
        Assert.Equal("TAF AMD XDMO 152345Z 1523/1621 24003KT 6000 BR TEMPO 1600/1603 0400 FG VV002 FM160430 9999 NSW",
            DemoForecastShift.Shift(Taf, s_written, TimeSpan.FromMinutes(200)));
    }

    [Fact]
    public void AcrossAMonthEnd_TheDaysFollowTheCalendar()
    {
        var shift = new DateTimeOffset(2026, 1, 31, 20, 30, 0, TimeSpan.Zero) - s_written; // 16 days
        Assert.Equal("TAF AMD XDMO 312025Z 3120/0118 24003KT 6000 BR TEMPO 3121/0100 0400 FG VV002 FM010130 9999 NSW",
            DemoForecastShift.Shift(Taf, s_written, shift));
    }

    [Fact]
    public void NoShift_LeavesTheTextAsWritten() => Assert.Equal(Taf, DemoForecastShift.Shift(Taf, s_written, TimeSpan.Zero));
}
