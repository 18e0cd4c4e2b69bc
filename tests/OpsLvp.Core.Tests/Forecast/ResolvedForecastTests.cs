using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// Placing decoded forecasts in time (docs/forecasts.md). Day/hour groups name the day of month only (WMO-No. 306
/// FM 51, from memory), so the month comes from the time the forecast was received. Forecasts are invented.
/// </summary>
public sealed class ResolvedForecastTests
{
    [Fact]
    public void ValidityAcrossTheEndOfAMonth_ResolvesIntoTheNextMonth()
    {
        var f = ResolvedForecast.FromTaf(TafDecoder.Decode("TAF XDMO 312300Z 0100/0124 9999 SCT030"),
            new DateTimeOffset(2026, 1, 31, 23, 5, 0, TimeSpan.Zero));
        Assert.Equal(new DateTimeOffset(2026, 1, 31, 23, 0, 0, TimeSpan.Zero), f.IssuedAt);
        Assert.Equal(new DateTimeOffset(2026, 2, 1, 0, 0, 0, TimeSpan.Zero), f.ValidFrom);
        Assert.Equal(new DateTimeOffset(2026, 2, 2, 0, 0, 0, TimeSpan.Zero), f.ValidUntil);
    }

    [Fact]
    public void Hour24_IsMidnightAtTheEndOfThatDay()
    {
        var f = ResolvedForecast.FromTaf(TafDecoder.Decode("TAF XDMO 010500Z 0106/0124 9999 SCT030 TEMPO 0120/0124 0300 FG"),
            new DateTimeOffset(2026, 3, 1, 5, 0, 0, TimeSpan.Zero));
        Assert.Equal(new DateTimeOffset(2026, 3, 2, 0, 0, 0, TimeSpan.Zero), f.ValidUntil);
        Assert.Equal(new DateTimeOffset(2026, 3, 2, 0, 0, 0, TimeSpan.Zero), f.Parts[^1].Until);
    }

    [Fact]
    public void Becmg_OverlapsTheConditionsBeforeItDuringItsWindow()
    {
        var f = ResolvedForecast.FromTaf(
            TafDecoder.Decode("TAF XDMO 010500Z 0106/0206 9999 SCT030 BECMG 0108/0110 0400 FG BKN002"),
            new DateTimeOffset(2026, 3, 1, 5, 0, 0, TimeSpan.Zero));
        Assert.Equal(2, f.Parts.Count);
        var (before, after) = (f.Parts[0], f.Parts[1]);
        Assert.Equal("base forecast", before.Group);
        Assert.Equal(10, before.Until.Hour);
        Assert.Equal(8, after.From.Hour);
        Assert.Equal(f.ValidUntil, after.Until);
    }

    [Fact]
    public void Becmg_StatingOnlyVisibility_KeepsTheCloudBeforeIt()
    {
        var f = ResolvedForecast.FromTaf(
            TafDecoder.Decode("TAF XDMO 010500Z 0106/0206 3000 BR BKN002 BECMG 0108/0110 0400"),
            new DateTimeOffset(2026, 3, 1, 5, 0, 0, TimeSpan.Zero));
        var after = f.Parts[1].Conditions;
        Assert.Equal(400, after.Visibility!.Distance.Value);
        Assert.Equal(200, after.FindCeiling(true)!.Value.Value);
    }

    [Fact]
    public void TrendTimes_ResolveAfterTheObservation_AcrossMidnight()
    {
        var observed = new DateTimeOffset(2026, 3, 1, 23, 50, 0, TimeSpan.Zero);
        var f = ResolvedForecast.FromTrend(TrendDecoder.Decode("TEMPO FM0010 TL0100 0300 FG"), "XDMO", "METAR XDMO 012350Z …", observed);
        var part = Assert.Single(f.Parts);
        Assert.Equal(new DateTimeOffset(2026, 3, 2, 0, 10, 0, TimeSpan.Zero), part.From);
        Assert.Equal(new DateTimeOffset(2026, 3, 2, 1, 0, 0, TimeSpan.Zero), part.Until);
        Assert.Equal(observed.AddHours(2), f.ValidUntil);
    }

    [Fact]
    public void NilTaf_CannotBePlaced()
    {
        Assert.Throws<ArgumentException>(() => ResolvedForecast.FromTaf(TafDecoder.Decode("TAF XDMO 010500Z NIL"), DateTimeOffset.UnixEpoch));
    }
}
