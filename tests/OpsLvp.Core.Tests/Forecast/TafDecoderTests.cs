using OpsLvp.Core.Reporting;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Metar;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// One example per TAF group form. Forms and their meaning: WMO-No. 306 Manual on Codes, code form FM 51 TAF, as
/// summarised in docs/sources.md "Forecasts" (details from memory there). Stations (X…) and all values are invented.
/// </summary>
public sealed class TafDecoderTests
{
    private static TafReport Body(string groups) => TafDecoder.Decode("TAF XDMO 010500Z 0106/0206 " + groups);

    // --- identification: WMO-No. 306 FM 51 section 1 (TAF [AMD|COR] CCCC YYGGggZ [NIL] Y1Y1G1G1/Y2Y2G2G2 [CNL])

    [Fact]
    public void Header_StationIssueTimeAndValidity_AreDecoded()
    {
        var r = Body("24005KT 9999 SCT030");
        Assert.Equal("XDMO", r.Station);
        Assert.Equal(new MetarObservationTime(1, 5, 0), r.IssueTime);
        Assert.Equal(new ForecastTime(1, 6, 0), r.Validity!.From);
        Assert.Equal(new ForecastTime(2, 6, 0), r.Validity.Until);
        Assert.False(r.Amended);
        Assert.False(r.Corrected);
        Assert.False(r.Cancelled);
        Assert.False(r.Nil);
        Assert.Empty(r.Changes);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void Header_Amended_IsMarked()
    {
        Assert.True(TafDecoder.Decode("TAF AMD XDMO 011030Z 0111/0206 0800 FG OVC002").Amended);
    }

    [Fact]
    public void Header_Corrected_IsMarked()
    {
        Assert.True(TafDecoder.Decode("TAF COR XDMO 010510Z 0106/0206 9999 NSC").Corrected);
    }

    [Fact]
    public void Header_ValidityEndingAtHour24_IsAccepted()
    {
        // FM 51 writes a period ending at midnight as DD24 (from memory).
        Assert.Equal(new ForecastTime(1, 24, 0), TafDecoder.Decode("TAF XDMO 010500Z 0106/0124 9999 NSC").Validity!.Until);
    }

    [Fact]
    public void Header_WithoutTafWord_IsAccepted()
    {
        Assert.Equal("XQRT", TafDecoder.Decode("XQRT 311700Z 3118/0124 CAVOK").Station);
    }

    [Fact]
    public void Nil_IsMarkedAndCarriesNoForecast()
    {
        var r = TafDecoder.Decode("TAF XDMO 010500Z NIL=");
        Assert.True(r.Nil);
        Assert.Null(r.Validity);
        Assert.Empty(r.Changes);
    }

    [Fact]
    public void Cancelled_IsMarkedWithItsValidity()
    {
        var r = TafDecoder.Decode("TAF AMD XDMO 011200Z 0112/0206 CNL");
        Assert.True(r.Cancelled);
        Assert.True(r.Amended);
        Assert.Equal(new ForecastTime(1, 12, 0), r.Validity!.From);
        Assert.Empty(r.Changes);
    }

    // --- forecast elements: visibility (metres, 9999, statute miles), CAVOK, weather, cloud, VV, NSC, NSW

    [Fact]
    public void Visibility_Metres_AreDecoded()
    {
        var v = Body("0300 FG").Base.Visibility!;
        Assert.Equal(new Metres(300), v.Distance);
        Assert.Null(v.Qualifier);
        Assert.Null(v.StatuteMiles);
    }

    [Fact]
    public void Visibility_9999_Is10kmOrMore()
    {
        // FM 15/51: 9999 = 10 km or more.
        var v = Body("9999 NSC").Base.Visibility!;
        Assert.Equal(new Metres(10_000), v.Distance);
        Assert.Equal(RvrQualifier.Above, v.Qualifier);
    }

    [Theory]
    // 1 statute mile = 1609.344 m exactly (international mile); forms from FAA FMH-1 — from memory.
    [InlineData("1/4SM", 0.25, 402.336, null)]
    [InlineData("3SM", 3.0, 4828.032, null)]
    [InlineData("M1/4SM", 0.25, 402.336, RvrQualifier.Below)]
    [InlineData("P6SM", 6.0, 9656.064, RvrQualifier.Above)]
    public void Visibility_StatuteMiles_AreConvertedAt1609344(string group, double miles, double metres, RvrQualifier? qualifier)
    {
        var v = Body(group + " BR OVC004").Base.Visibility!;
        Assert.Equal(miles, v.StatuteMiles);
        Assert.Equal(metres, v.Distance.Value, 6);
        Assert.Equal(qualifier, v.Qualifier);
    }

    [Fact]
    public void Visibility_WholeAndFractionMiles_InTwoGroups_AreOneValue()
    {
        var r = Body("1 1/2SM BR OVC004");
        Assert.Equal(1.5, r.Base.Visibility!.StatuteMiles);
        Assert.Equal(2414.016, r.Base.Visibility.Distance.Value, 6);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void Cavok_GivesTenKilometresAndNoCeiling()
    {
        var b = Body("24005KT CAVOK").Base;
        Assert.True(b.Cavok);
        Assert.Equal(new Metres(10_000), b.Visibility!.Distance);
        Assert.Null(b.FindCeiling(true));
    }

    [Fact]
    public void WeatherCloudAndVerticalVisibility_AreDecoded()
    {
        var b = Body("0200 FZFG BCFG SCT001 BKN003 VV002").Base;
        Assert.Equal(["FZFG", "BCFG"], b.Weather.Select(w => w.Code));
        Assert.Equal(2, b.Clouds.Count);
        Assert.Equal(new Feet(300), b.Clouds[1].Base);
        Assert.Equal(new Feet(200), b.VerticalVisibility);
        // Ceiling: lowest BKN/OVC or VV, whichever is lower (ICAO/EASA ceiling; VV counted is local practice).
        Assert.Equal(new Feet(200), b.FindCeiling(true));
        Assert.Equal(new Feet(300), b.FindCeiling(false));
    }

    [Fact]
    public void NscAndNsw_AreDecoded()
    {
        var c = Body("0800 BR BKN004 BECMG 0110/0112 9999 NSW NSC").Changes.Single().Conditions;
        Assert.True(c.NoSignificantWeather);
        Assert.Equal("NSC", c.SkyCondition);
        Assert.Null(c.FindCeiling(true));
    }

    [Fact]
    public void TemperatureWindShearAndUnknownGroups_AreSkipped_UnknownListed()
    {
        var r = Body("24005KT 9999 SCT030 TX12/0114Z TNM02/0205Z WS020/24040KT QQQQ");
        Assert.Equal(["QQQQ"], r.UnknownGroups);
    }

    // --- change groups: WMO-No. 306 FM 51 section 2 (BECMG, TEMPO, FM, PROB30/PROB40 [TEMPO])

    [Fact]
    public void ChangeGroups_EveryKind_WithWindowsInOrder()
    {
        var r = Body("9999 SCT030 BECMG 0108/0110 2000 BR BKN005 TEMPO 0110/0114 0300 FG VV002 "
            + "PROB30 TEMPO 0114/0116 0100 FZFG FM011800 27010KT 3SM BR OVC004 PROB40 0120/0124 0500 FG");
        Assert.Equal(
            [ForecastChangeKind.Becoming, ForecastChangeKind.Temporary, ForecastChangeKind.Temporary, ForecastChangeKind.From, ForecastChangeKind.Probability],
            r.Changes.Select(c => c.Kind));
        Assert.Equal([null, null, 30, null, 40], r.Changes.Select(c => c.Probability));
        Assert.Equal(["BECMG", "TEMPO", "PROB30 TEMPO", "FM", "PROB40"], r.Changes.Select(c => c.Indicator));
        Assert.Equal(["0108/0110", "0110/0114", "0114/0116", "FM011800", "0120/0124"], r.Changes.Select(c => c.Window.ToString()));
        Assert.Equal("TEMPO 0110/0114 0300 FG VV002", r.Changes[1].Text);
        Assert.Equal(new Metres(300), r.Changes[1].Conditions.Visibility!.Distance);
        Assert.Equal(new Feet(200), r.Changes[1].Conditions.VerticalVisibility);
        Assert.Equal(new ForecastTime(1, 18, 0), r.Changes[3].Window.From);
        Assert.Null(r.Changes[3].Window.Until);
        Assert.Equal(3, r.Changes[3].Conditions.Visibility!.StatuteMiles);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void ChangeGroup_StatingOnlyCloud_LeavesVisibilityUnstated()
    {
        var c = Body("9999 SCT030 TEMPO 0110/0114 BKN004").Changes.Single().Conditions;
        Assert.Null(c.Visibility);
        Assert.False(c.StatesVisibility);
        Assert.True(c.StatesCloud);
    }

    [Fact]
    public void Remarks_EndTheForecast()
    {
        var r = Body("9999 SCT030 RMK NXT FCST BY 11Z");
        Assert.Equal("NXT FCST BY 11Z", r.Remarks);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void LowerCaseAndTrailingEquals_AreAccepted()
    {
        var r = TafDecoder.Decode("taf xdmo 010500z 0106/0206 0400 fg vv001=");
        Assert.Equal(new Metres(400), r.Base.Visibility!.Distance);
    }

    // --- refusals: text that is not a TAF gets a message saying what was expected

    [Theory]
    [InlineData("", "empty forecast")]
    [InlineData("hello world", "'HELLO' is not a location indicator")]
    [InlineData("METAR XDMO 010620Z 24004KT 0400 FG", "this is a METAR, not a TAF")]
    [InlineData("XDMO 010620Z 24004KT 0400 FG", "validity period was expected")]
    [InlineData("TAF XDMO 0106/0206 9999", "not an issue time")]
    [InlineData("TAF XDMO 010500Z 0106/0206 9999 TEMPO 0300 FG", "change group 'TEMPO' has no time window")]
    [InlineData("TAF XDMO 010500Z 0106/0206 9999 PROB30 0300 FG", "change group 'PROB30' has no time window")]
    [InlineData("TAF XDMO 010500Z 0106/0206 9999 NOSIG", "NOSIG belongs to the TREND")]
    [InlineData("TAF XDMO 010500Z 0106/0225 9999", "out of range")]
    [InlineData("TAF XDMO 320500Z 0106/0206 9999", "issue time '320500Z' is out of range")]
    public void NotATaf_IsRefusedWithAMessage(string text, string expected)
    {
        Assert.False(TafDecoder.TryDecode(text, out var report, out var error));
        Assert.Null(report);
        Assert.Contains(expected, error, StringComparison.Ordinal);
    }
}
