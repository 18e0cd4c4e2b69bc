using OpsLvp.Core.Forecast;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// <see cref="ForecastTrigger.Evaluate"/> (docs/forecasts.md). Change-group meanings: WMO-No. 306 FM 51 / FM 15 (from
/// memory, docs/sources.md "Forecasts"). The deterioration values (1000 m, 300 ft), the horizon and every forecast are invented
/// and illustrative; dates are invented (1 March 2026).
/// </summary>
public sealed class ForecastTriggerTests
{
    private static readonly DateTimeOffset s_day = new(2026, 3, 1, 0, 0, 0, TimeSpan.Zero);

    private static DateTimeOffset At(int hour, int minute = 0) => s_day.AddHours(hour).AddMinutes(minute);

    private static ForecastSettings Settings(bool tempo = true, bool prob30 = false, bool prob40 = true, int horizonMinutes = 180) => new()
    {
        HorizonMinutes = horizonMinutes,
        VisibilityBelowM = 1000,
        CeilingBelowFt = 300,
        CountTempo = tempo,
        CountProb30 = prob30,
        CountProb40 = prob40,
    };

    private static ResolvedForecast Taf(string text, DateTimeOffset receivedAt) =>
        ResolvedForecast.FromTaf(TafDecoder.Decode(text), receivedAt);

    private static ResolvedForecast Trend(string metar, DateTimeOffset observedAt)
    {
        var report = Core.Metar.MetarDecoder.Decode(metar);
        return ResolvedForecast.FromTrend(TrendDecoder.Decode(report.Trend), report.Station, metar, observedAt);
    }

    private const string TempoFog = "TAF XDMO 010500Z 0106/0206 24005KT 9999 SCT030 TEMPO 0107/0110 0300 FG VV002";

    // --- which change groups count (profile forecast.countTempo / countProb30 / countProb40)

    [Fact]
    public void Tempo_Counted_SetsTheFlagWithItsSource()
    {
        var result = ForecastTrigger.Evaluate([Taf(TempoFog, At(5, 2))], At(5, 30), Settings(tempo: true));
        Assert.True(result.On);
        var source = result.Source!;
        Assert.Equal(ForecastOrigin.Taf, source.Origin);
        Assert.Equal("XDMO", source.Station);
        Assert.Equal(TempoFog, source.ReportText);
        Assert.Equal("TEMPO 0107/0110 0300 FG VV002", source.Group);
        Assert.Equal(At(7), source.From);
        Assert.Equal(At(10), source.Until);
        Assert.Equal(new Metres(300), source.Visibility);
        Assert.Equal(new Feet(200), source.Ceiling);
    }

    [Fact]
    public void Tempo_NotCounted_LeavesTheFlagOff()
    {
        var result = ForecastTrigger.Evaluate([Taf(TempoFog, At(5, 2))], At(5, 30), Settings(tempo: false));
        Assert.False(result.On);
        Assert.Null(result.Source);
        Assert.Contains("no counted part", result.Reason, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Becmg_AlwaysCounts_FromTheStartOfItsWindow(bool tempo)
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 BECMG 0107/0109 0400 FG BKN002", At(5, 2));
        var result = ForecastTrigger.Evaluate([taf], At(5, 30), Settings(tempo: tempo));
        Assert.True(result.On);
        Assert.Equal(At(7), result.Source!.From);
        // BECMG conditions last to the end of the validity when nothing later changes them.
        Assert.Equal(s_day.AddDays(1).AddHours(6), result.Source.Until);
    }

    [Theory]
    [InlineData(false, false)]
    [InlineData(true, true)]
    public void Prob30Alone_CountsOnlyWhenProb30Counts(bool prob30, bool expected)
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 PROB30 0107/0110 0200 FG", At(5, 2));
        Assert.Equal(expected, ForecastTrigger.Evaluate([taf], At(5, 30), Settings(tempo: true, prob30: prob30)).On);
    }

    [Theory]
    [InlineData(true, false, false)]
    [InlineData(false, true, false)]
    [InlineData(true, true, true)]
    public void Prob30Tempo_NeedsBothTempoAndProb30Counted(bool tempo, bool prob30, bool expected)
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 PROB30 TEMPO 0107/0110 0200 FG", At(5, 2));
        Assert.Equal(expected, ForecastTrigger.Evaluate([taf], At(5, 30), Settings(tempo: tempo, prob30: prob30)).On);
    }

    [Fact]
    public void Prob40Tempo_CountsWithTempoAndProb40()
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 PROB40 TEMPO 0107/0110 0200 FG", At(5, 2));
        Assert.True(ForecastTrigger.Evaluate([taf], At(5, 30), Settings(tempo: true, prob40: true)).On);
        Assert.False(ForecastTrigger.Evaluate([taf], At(5, 30), Settings(tempo: true, prob40: false)).On);
    }

    // --- deterioration values and horizon

    [Fact]
    public void VisibilityAtTheValue_IsNotBelowIt()
    {
        // Strict comparison, as the engine's entry thresholds (docs/engine.md R4).
        var taf = Taf("TAF XDMO 010500Z 0106/0206 1000 BR SCT030", At(5, 2));
        Assert.False(ForecastTrigger.Evaluate([taf], At(6), Settings()).On);
        var lower = Taf("TAF XDMO 010500Z 0106/0206 0900 BR SCT030", At(5, 2));
        Assert.True(ForecastTrigger.Evaluate([lower], At(6), Settings()).On);
    }

    [Fact]
    public void CeilingBelowTheValue_AloneSetsTheFlag()
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 5000 BR BKN002", At(5, 2));
        var result = ForecastTrigger.Evaluate([taf], At(6), Settings());
        Assert.True(result.On);
        Assert.Equal("base forecast", result.Source!.Group);
        Assert.Null(result.Source.Visibility);
        Assert.Equal(new Feet(200), result.Source.Ceiling);
    }

    [Fact]
    public void StatuteMiles_AreJudgedInMetres()
    {
        // 1/2SM = 804.672 m < 1000 m; 1SM = 1609.344 m is not.
        Assert.True(ForecastTrigger.Evaluate([Taf("TAF XDMO 010500Z 0106/0206 1/2SM FG OVC005", At(5, 2))], At(6), Settings()).On);
        Assert.False(ForecastTrigger.Evaluate([Taf("TAF XDMO 010500Z 0106/0206 1SM BR OVC005", At(5, 2))], At(6), Settings()).On);
    }

    [Fact]
    public void DeteriorationBeyondTheHorizon_DoesNotCountYet()
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 TEMPO 0110/0114 0300 FG", At(5, 2));
        Assert.False(ForecastTrigger.Evaluate([taf], At(6), Settings(horizonMinutes: 240)).On);
        Assert.True(ForecastTrigger.Evaluate([taf], At(6, 1), Settings(horizonMinutes: 240)).On);
    }

    [Fact]
    public void TempoWhoseWindowHasPassed_NoLongerCounts()
    {
        Assert.False(ForecastTrigger.Evaluate([Taf(TempoFog, At(5, 2))], At(10), Settings()).On);
    }

    [Fact]
    public void FmGroup_EndsTheFogForecastBeforeIt()
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 BECMG 0107/0109 0300 FG VV002 FM011400 24010KT 9999 NSC", At(5, 2));
        Assert.Equal(At(14), ForecastTrigger.Evaluate([taf], At(6), Settings()).Source!.Until);
        Assert.False(ForecastTrigger.Evaluate([taf], At(14), Settings()).On);
    }

    // --- newer forecasts, amendments, cancellations, expiry

    [Fact]
    public void AmendedTaf_ThatNoLongerForecastsFog_ClearsTheFlag()
    {
        var original = Taf(TempoFog, At(5, 2));
        var amended = Taf("TAF AMD XDMO 010610Z 0106/0206 24008KT 9999 SCT030", At(6, 12));
        Assert.True(ForecastTrigger.Evaluate([original], At(6, 11), Settings()).On);
        var result = ForecastTrigger.Evaluate([original, amended], At(6, 12), Settings());
        Assert.False(result.On);
        Assert.Contains("TAF XDMO 010610Z", result.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void AmendedTaf_NotYetReceived_DoesNotCountYet()
    {
        var original = Taf(TempoFog, At(5, 2));
        var amended = Taf("TAF AMD XDMO 010610Z 0106/0206 24008KT 9999 SCT030", At(6, 12));
        Assert.True(ForecastTrigger.Evaluate([original, amended], At(6), Settings()).On);
    }

    [Fact]
    public void NextTafIssuedBeforeItsValidity_TheOlderSpeaksUntilTheNewerBegins()
    {
        var older = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 TEMPO 0111/0113 0300 FG", At(5, 2));
        var next = Taf("TAF XDMO 011100Z 0112/0218 24008KT 9999 SCT030", At(11, 2));
        var before = ForecastTrigger.Evaluate([older, next], At(11, 5), Settings());
        Assert.True(before.On);
        Assert.Equal(At(11), before.Source!.From);
        // From 1200 the newer TAF covers the rest of the TEMPO window and forecasts no fog.
        Assert.False(ForecastTrigger.Evaluate([older, next], At(12), Settings()).On);
    }

    [Fact]
    public void CancelledTaf_ClearsTheFlag()
    {
        var original = Taf(TempoFog, At(5, 2));
        var cancelled = Taf("TAF AMD XDMO 010620Z 0106/0206 CNL", At(6, 21));
        var result = ForecastTrigger.Evaluate([original, cancelled], At(6, 30), Settings());
        Assert.False(result.On);
        Assert.Contains("cancelled", result.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void ExpiredTaf_NeverCounts()
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0112 0300 FG VV002", At(5, 2));
        Assert.True(ForecastTrigger.Evaluate([taf], At(11, 59), Settings()).On);
        var result = ForecastTrigger.Evaluate([taf], At(12), Settings());
        Assert.False(result.On);
        Assert.Contains("expired at 011200Z", result.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void NoForecast_LeavesTheFlagOff()
    {
        Assert.False(ForecastTrigger.Evaluate([], At(6), Settings()).On);
    }

    // --- TREND of the newest METAR/SPECI

    [Fact]
    public void TrendTempoFog_SetsTheFlagWithTheMetarAsSource()
    {
        const string metar = "METAR XDMO 010620Z 24004KT 2500 BR BKN008 08/07 Q1021 TEMPO FM0640 0400 FG VV002";
        var result = ForecastTrigger.Evaluate([Trend(metar, At(6, 20))], At(6, 21), Settings());
        Assert.True(result.On);
        Assert.Equal(ForecastOrigin.Trend, result.Source!.Origin);
        Assert.Equal(metar, result.Source.ReportText);
        Assert.Equal(At(6, 40), result.Source.From);
        Assert.Equal(At(8, 20), result.Source.Until);
    }

    [Fact]
    public void NewerNosigTrend_SpeaksForItsTwoHours_TheTafForTheRest()
    {
        var taf = Taf("TAF XDMO 010500Z 0106/0206 9999 SCT030 TEMPO 0108/0112 0300 FG", At(5, 2));
        var nosig = Trend("METAR XDMO 010620Z 24004KT 9999 SCT030 08/07 Q1021 NOSIG", At(6, 20));
        // Look-ahead to 0820: the TEMPO from 0800 lies wholly inside the trend's 0620–0820, which forecasts no change.
        Assert.False(ForecastTrigger.Evaluate([taf, nosig], At(6, 20), Settings(horizonMinutes: 120)).On);
        // Look-ahead to 0920: from 0820 the TAF speaks again.
        var result = ForecastTrigger.Evaluate([taf, nosig], At(6, 20), Settings(horizonMinutes: 180));
        Assert.True(result.On);
        Assert.Equal(ForecastOrigin.Taf, result.Source!.Origin);
    }

    [Fact]
    public void ShortForm_NamesOriginWindowAndGroup()
    {
        var taf = Taf("TAF XDMO 010400Z 0105/0205 9999 SCT030 TEMPO 0105/0109 0300 FG VV002", At(4, 2));
        Assert.Equal("TAF 0500–0900 TEMPO 0300 FG VV002", ForecastTrigger.Evaluate([taf], At(5), Settings()).Source!.ShortForm);
    }
}
