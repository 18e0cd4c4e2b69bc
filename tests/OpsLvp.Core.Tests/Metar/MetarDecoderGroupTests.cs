using OpsLvp.Core.Metar;
using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// One example per group form. Group forms and their meaning: WMO-No. 306 Manual on Codes, code form FM 15 METAR /
/// FM 16 SPECI, as summarised in docs/sources.md "METAR/SPECI groups". Station XDMO and all values are invented.
/// </summary>
public sealed class MetarDecoderGroupTests
{
    private static MetarReport Body(string groups) => MetarDecoder.Decode("METAR XDMO 010620Z 24004KT " + groups);

    // --- identification groups: WMO-No. 306 FM 15 section 1 (METAR/SPECI, COR, CCCC, YYGGggZ, NIL, AUTO)

    [Fact]
    public void Header_MetarWithStationAndTime_IsDecoded()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 0400 FG");
        Assert.Equal(MetarReportType.Metar, r.Type);
        Assert.Equal("XDMO", r.Station);
        Assert.Equal(new MetarObservationTime(1, 6, 20), r.Time);
        Assert.False(r.Corrected);
        Assert.False(r.Automatic);
        Assert.False(r.Nil);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void Header_SpeciCorAuto_SetsAllFlags()
    {
        // WMO-No. 306 FM 16: SPECI COR CCCC YYGGggZ AUTO
        var r = MetarDecoder.Decode("SPECI COR XQRT 312359Z AUTO 00000KT 0150 FZFG VV001");
        Assert.Equal(MetarReportType.Speci, r.Type);
        Assert.True(r.Corrected);
        Assert.True(r.Automatic);
        Assert.Equal(new MetarObservationTime(31, 23, 59), r.Time);
    }

    [Fact]
    public void Header_CorAfterTimeGroup_IsAlsoAccepted()
    {
        Assert.True(MetarDecoder.Decode("METAR XDMO 010620Z COR 24004KT 0400 FG").Corrected);
    }

    [Fact]
    public void Header_WithoutReportTypeWord_IsAccepted()
    {
        var r = MetarDecoder.Decode("XDMO 010620Z 24004KT 0400 FG");
        Assert.Null(r.Type);
        Assert.Equal("XDMO", r.Station);
    }

    [Fact]
    public void Nil_ReportIsMarkedNilAndCarriesNoValues()
    {
        var r = MetarDecoder.Decode("METAR XKRB 050500Z NIL");
        Assert.True(r.Nil);
        Assert.Null(r.Visibility);
        Assert.Empty(r.Rvr);
        Assert.Null(r.Ceiling);
    }

    [Fact]
    public void Trailing_EndOfMessageSign_IsIgnored()
    {
        var r = MetarDecoder.Decode("METAR XDMO 010620Z 24004KT 0400 FG VV002=");
        Assert.Equal(new Feet(200), r.VerticalVisibility);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void LowerCase_IsFoldedToUpperCase()
    {
        var r = MetarDecoder.Decode("metar xdmo 010620z 24004kt 0400 r26l/0550n fg");
        Assert.Equal("XDMO", r.Station);
        Assert.Equal("26L", Assert.Single(r.Rvr).Runway);
    }

    // --- visibility VVVV [VnVnVnVnDv]: WMO-No. 306 FM 15; 9999 = 10 km or more (docs/sources.md "Visibility")

    [Fact]
    public void Visibility_FourDigits_IsMetres()
    {
        Assert.Equal(new Metres(400), Body("0400 FG").Visibility);
    }

    [Fact]
    public void Visibility_9999_Means10KmOrMore()
    {
        Assert.Equal(new Metres(10_000), Body("9999 NSC").Visibility);
    }

    [Fact]
    public void Visibility_WithMinimumAndDirection_DecodesBoth()
    {
        var r = Body("0400 0200NE FG");
        Assert.Equal(new Metres(400), r.Visibility);
        Assert.Equal(new MetarMinimumVisibility(new Metres(200), "NE"), r.MinimumVisibility);
    }

    [Fact]
    public void Visibility_Ndv_IsFlagged()
    {
        var r = Body("9999NDV NCD");
        Assert.Equal(new Metres(10_000), r.Visibility);
        Assert.True(r.NoDirectionalVariation);
    }

    [Fact]
    public void Visibility_Missing_IsNullAndNotUnknown()
    {
        var r = Body("//// NCD");
        Assert.Null(r.Visibility);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void Visibility_Absent_IsNull()
    {
        Assert.Null(Body("FEW010 10/08 Q1020").Visibility);
    }

    [Fact]
    public void Cavok_GivesTenKilometresAndNoCloudOrCeiling()
    {
        // WMO-No. 306 FM 15: CAVOK replaces visibility, weather and cloud (visibility >= 10 km).
        var r = Body("CAVOK 12/05 Q1018");
        Assert.True(r.Cavok);
        Assert.Equal(new Metres(10_000), r.Visibility);
        Assert.Empty(r.Clouds);
        Assert.Null(r.Ceiling);
    }

    // --- RVR Rdd[L|C|R]/[M|P]VRVRVRVR[VVRVRVRVR][i]: WMO-No. 306 FM 15; ICAO Annex 3 App 3 §4.3.6 (docs/sources.md)

    [Fact]
    public void Rvr_SteadyWithTendency_R26L0550N()
    {
        var rvr = Assert.Single(Body("0400 R26L/0550N FG").Rvr);
        Assert.Equal("26L", rvr.Runway);
        Assert.Equal(new Metres(550), rvr.Value);
        Assert.Null(rvr.Max);
        Assert.Equal(RvrQualifier.None, rvr.Qualifier);
        Assert.Equal(RvrTendency.NoChange, rvr.Tendency);
        Assert.Equal(RvrReportedUnit.Metres, rvr.ReportedUnit);
    }

    [Fact]
    public void Rvr_BelowLowerLimit_R08M0050()
    {
        var rvr = Assert.Single(Body("0100 R08/M0050 FG").Rvr);
        Assert.Equal(new Metres(50), rvr.Value);
        Assert.Equal(RvrQualifier.Below, rvr.Qualifier);
        Assert.Null(rvr.Tendency);
    }

    [Fact]
    public void Rvr_AboveUpperLimit_R33P2000()
    {
        var rvr = Assert.Single(Body("1200 R33/P2000 BR").Rvr);
        Assert.Equal(new Metres(2000), rvr.Value);
        Assert.Equal(RvrQualifier.Above, rvr.Qualifier);
    }

    [Fact]
    public void Rvr_Varying_R15_0400V0800U_GivesMinimumMaximumAndTendency()
    {
        var rvr = Assert.Single(Body("0500 R15/0400V0800U FG").Rvr);
        Assert.Equal(new Metres(400), rvr.Value);
        Assert.Equal(new Metres(800), rvr.Max);
        Assert.Equal(RvrTendency.Up, rvr.Tendency);
    }

    [Fact]
    public void Rvr_VaryingWithQualifiedMaximum_KeepsMaxQualifier()
    {
        var rvr = Assert.Single(Body("0400 R20/0450VP2000U FG").Rvr);
        Assert.Equal(RvrQualifier.None, rvr.Qualifier);
        Assert.Equal(RvrQualifier.Above, rvr.MaxQualifier);
        Assert.Equal(new Metres(2000), rvr.Max);
    }

    [Fact]
    public void Rvr_DownwardTendency_D()
    {
        Assert.Equal(RvrTendency.Down, Assert.Single(Body("0400 R26/0600D FG").Rvr).Tendency);
    }

    [Fact]
    public void Rvr_InFeet_IsConvertedToMetresRoundedDownAndKeepsOriginal()
    {
        // 1 ft = 0.3048 m (international foot); 1200 ft = 365.76 m, rounded down as Annex 3 rounds RVR down.
        var rvr = Assert.Single(Body("1200 R22/1200FT BR").Rvr);
        Assert.Equal(new Metres(365), rvr.Value);
        Assert.Equal(RvrReportedUnit.Feet, rvr.ReportedUnit);
        Assert.Equal(1200, rvr.ReportedValue);
    }

    [Fact]
    public void Rvr_InFeetVaryingAboveLimit_ConvertsBothEnds()
    {
        // 1000 ft = 304.8 m -> 304; 6000 ft = 1828.8 m -> 1828 (0.3048 m/ft).
        var rvr = Assert.Single(Body("1200 R26/1000VP6000FT/U BR").Rvr);
        Assert.Equal(new Metres(304), rvr.Value);
        Assert.Equal(new Metres(1828), rvr.Max);
        Assert.Equal(RvrQualifier.Above, rvr.MaxQualifier);
        Assert.Equal(6000, rvr.ReportedMax);
        Assert.Equal(RvrTendency.Up, rvr.Tendency);
    }

    [Fact]
    public void Rvr_SeveralRunwaysWithLeftCentreRight_AreAllKept()
    {
        var r = Body("0600 R22L/0550N R22C/0500U R22R/0600D FG");
        Assert.Equal(["22L", "22C", "22R"], r.Rvr.Select(x => x.Runway));
        Assert.Equal([550.0, 500.0, 600.0], r.Rvr.Select(x => x.Value!.Value.Value));
    }

    [Fact]
    public void Rvr_Missing_R09Slashes_IsListedWithoutValue()
    {
        var rvr = Assert.Single(Body("0150 R09///// FZFG").Rvr);
        Assert.Equal("09", rvr.Runway);
        Assert.True(rvr.IsMissing);
        Assert.Null(rvr.Value);
    }

    [Fact]
    public void RunwayState_IsNotMistakenForRvr()
    {
        // WMO-No. 306 FM 15 runway state group RDRDR/ERCReReRBRBR.
        var r = Body("0350 R31/0400N R31/450195 FG");
        Assert.Single(r.Rvr);
        Assert.Empty(r.UnknownGroups);
    }

    // --- present weather w'w': WMO-No. 306 code table 4678 (intensity, descriptor, phenomena)

    [Theory]
    [InlineData("FG")]
    [InlineData("BR")]
    [InlineData("MIFG")]
    [InlineData("BCFG")]
    [InlineData("PRFG")]
    [InlineData("FZFG")]
    [InlineData("HZ")]
    [InlineData("FU")]
    [InlineData("VCFG")]
    [InlineData("-RA")]
    [InlineData("+RA")]
    [InlineData("DZ")]
    [InlineData("SN")]
    [InlineData("+TSRA")]
    [InlineData("-SHSN")]
    [InlineData("FZDZ")]
    [InlineData("VCSH")]
    [InlineData("BLSN")]
    public void Weather_Group_IsKeptAsWritten(string code)
    {
        var r = Body("0800 " + code + " BKN010");
        Assert.Equal(code, Assert.Single(r.Weather).Code);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void Weather_Parts_AreSplitIntoIntensityDescriptorAndPhenomena()
    {
        var w = Assert.Single(Body("3000 +TSRAGR BKN020CB").Weather);
        Assert.Equal("+", w.Intensity);
        Assert.Equal("TS", w.Descriptor);
        Assert.Equal(["RA", "GR"], w.Phenomena);
    }

    [Fact]
    public void Weather_Recent_IsKeptApartFromPresentWeather()
    {
        var r = Body("4000 REFG BR FEW003");
        Assert.Equal("BR", Assert.Single(r.Weather).Code);
        Assert.Equal("FG", Assert.Single(r.RecentWeather).Code);
    }

    [Fact]
    public void Weather_NotObservable_IsRecognisedWithoutEntry()
    {
        var r = MetarDecoder.Decode("METAR XKRB 050330Z AUTO 27003KT 0300 // VV///");
        Assert.Empty(r.Weather);
        Assert.Empty(r.UnknownGroups);
    }

    // --- cloud NsNsNshshshs[CC], VVhshshs, NSC, NCD: WMO-No. 306 FM 15; heights in hundreds of feet

    [Fact]
    public void Cloud_Layers_AreDecodedInHundredsOfFeet()
    {
        var r = Body("3000 FEW005 SCT010 BKN020 OVC040");
        Assert.Equal(
            [(CloudCover.Few, 500.0), (CloudCover.Scattered, 1000.0), (CloudCover.Broken, 2000.0), (CloudCover.Overcast, 4000.0)],
            r.Clouds.Select(c => (c.Cover!.Value, c.Base!.Value.Value)));
    }

    [Fact]
    public void Cloud_Bkn002_Is200Feet()
    {
        Assert.Equal(new Feet(200), Assert.Single(Body("0600 FG BKN002").Clouds).Base);
    }

    [Fact]
    public void Cloud_CbAndTcu_AreKept()
    {
        var r = Body("5000 FEW015CB BKN025TCU");
        Assert.Equal([CloudType.Cumulonimbus, CloudType.ToweringCumulus], r.Clouds.Select(c => c.Type!.Value));
    }

    [Fact]
    public void Cloud_HeightNotDeterminable_HasNullBase()
    {
        var layer = Assert.Single(Body("0400 FG BKN///").Clouds);
        Assert.Equal(CloudCover.Broken, layer.Cover);
        Assert.Null(layer.Base);
    }

    [Fact]
    public void Cloud_CoverNotDeterminable_HasNullCoverAndIsNoCeiling()
    {
        var r = Body("0400 FG ///001");
        Assert.Null(Assert.Single(r.Clouds).Cover);
        Assert.Null(r.Ceiling);
    }

    [Fact]
    public void Cloud_AllNotObservable_GivesNoLayer()
    {
        var r = Body("0400 FG //////");
        Assert.Empty(r.Clouds);
        Assert.Empty(r.UnknownGroups);
    }

    [Theory]
    [InlineData("NSC")]
    [InlineData("NCD")]
    [InlineData("SKC")]
    [InlineData("CLR")]
    public void Cloud_NoCloudWords_AreSkyConditionNotLayers(string word)
    {
        var r = Body("9999 " + word);
        Assert.Equal(word, r.SkyCondition);
        Assert.Empty(r.Clouds);
        Assert.Null(r.Ceiling);
        Assert.True(r.StatesNoCeiling);
    }

    [Fact]
    public void VerticalVisibility_VV001_Is100Feet()
    {
        var r = Body("0150 FG VV001");
        Assert.Equal(new Feet(100), r.VerticalVisibility);
        Assert.True(r.SkyObscured);
    }

    [Fact]
    public void VerticalVisibility_NotDeterminable_IsNullButSkyObscured()
    {
        var r = Body("0150 FG VV///");
        Assert.Null(r.VerticalVisibility);
        Assert.True(r.SkyObscured);
        Assert.Null(r.Ceiling);
        Assert.False(r.StatesNoCeiling);
    }

    // --- ceiling: lowest BKN/OVC below 20 000 ft (ICAO/EASA definition), or vertical visibility (docs/cli.md)

    [Fact]
    public void Ceiling_IsLowestBrokenOrOvercastNotLowestLayer()
    {
        Assert.Equal(new Feet(300), Body("0600 FG SCT001 FEW002 BKN003 OVC005").Ceiling);
    }

    [Fact]
    public void Ceiling_LayerAt19900Feet_Counts()
    {
        Assert.Equal(new Feet(19_900), Body("9999 BKN199").Ceiling);
    }

    [Fact]
    public void Ceiling_LayerAt20000FeetOrAbove_DoesNotCount()
    {
        var r = Body("9999 SCT020 BKN200 OVC250");
        Assert.Null(r.Ceiling);
        Assert.True(r.StatesNoCeiling);
    }

    [Fact]
    public void Ceiling_FromVerticalVisibility_WhenNoLayer()
    {
        Assert.Equal(new Feet(0), Body("0100 FG VV000").Ceiling);
    }

    [Fact]
    public void Ceiling_WithoutVerticalVisibility_WhenLocalPracticeSaysSo()
    {
        // docs/sources.md: counting vertical visibility as ceiling is local practice (profile option).
        Assert.Null(Body("0100 FG VV001").FindCeiling(countVerticalVisibility: false));
    }

    [Fact]
    public void Ceiling_NoneWhenOnlyFewAndScattered()
    {
        Assert.Null(Body("3000 BR FEW002 SCT004").Ceiling);
    }

    // --- groups recognised and skipped; end of the decoded part

    [Fact]
    public void Skipped_WindTemperaturePressureWindShearAndSea_AreNotUnknown()
    {
        var r = MetarDecoder.Decode(
            "METAR XDMO 010620Z 24012G25KT 200V280 0800 FG BKN002 M01/M02 Q1021 A2992 WS R26 WS ALL RWY W12/S2");
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void Trend_EndsDecodedPart()
    {
        var r = Body("3000 BR BKN010 12/11 Q1012 TEMPO 0200 FG VV001");
        Assert.Equal(new Metres(3000), r.Visibility);
        Assert.Equal(["BR"], r.Weather.Select(w => w.Code));
        Assert.Null(r.VerticalVisibility);
        Assert.Equal("TEMPO 0200 FG VV001", r.Trend);
    }

    [Theory]
    [InlineData("NOSIG")]
    [InlineData("BECMG 0500 FG")]
    public void Trend_OtherWords_AlsoEndDecodedPart(string trend)
    {
        var r = Body("9999 NSC 12/05 Q1018 " + trend);
        Assert.Equal(trend, r.Trend);
        Assert.Empty(r.Weather);
    }

    [Fact]
    public void Remarks_EndDecodedPart()
    {
        var r = Body("9999 FEW040 10/05 Q1018 RMK BKN003 FG BANK");
        Assert.Null(r.Ceiling);
        Assert.Equal("BKN003 FG BANK", r.Remarks);
    }

    [Fact]
    public void TrendThenRemarks_AreKeptApart()
    {
        var r = Body("9999 NSC 10/05 Q1018 NOSIG RMK FG BANK");
        Assert.Equal("NOSIG", r.Trend);
        Assert.Equal("FG BANK", r.Remarks);
    }

    [Fact]
    public void UnknownGroups_AreSkippedAndListed()
    {
        var r = Body("04O0 R20/ FG XYZ123 OVC002");
        Assert.Equal(["04O0", "R20/", "XYZ123"], r.UnknownGroups);
        Assert.Equal(new Feet(200), r.Ceiling);
    }

    // --- refusals: text that is not a METAR/SPECI

    [Theory]
    [InlineData("", "empty")]
    [InlineData("   ", "empty")]
    [InlineData("hello world", "'HELLO' is not a location indicator")]
    [InlineData("METAR", "no location indicator")]
    [InlineData("METAR XDMO", "no time group")]
    [InlineData("METAR XDMO 24004KT 0400 FG", "'24004KT' is not a time group")]
    [InlineData("METAR XDMO 0106Z 0400", "'0106Z' is not a time group")]
    [InlineData("METAR XDMO 320620Z 0400", "out of range")]
    [InlineData("METAR XDMO 012460Z 0400", "out of range")]
    [InlineData("METAR XDMO 000620Z 0400", "out of range")]
    [InlineData("SPECI 12345 010620Z 0400", "'12345' is not a location indicator")]
    public void NotAMetar_IsRefusedWithAClearMessage(string text, string expected)
    {
        var ex = Assert.Throws<MetarFormatException>(() => MetarDecoder.Decode(text));
        Assert.Contains(expected, ex.Message, StringComparison.Ordinal);
        Assert.False(MetarDecoder.TryDecode(text, out var report, out var error));
        Assert.Null(report);
        Assert.Equal(ex.Message, error);
    }

    [Fact]
    public void NonAsciiDigits_AreNotTakenAsAValue()
    {
        // "٠٤٠٠" are Arabic-Indic digits: not a WMO-No. 306 visibility group, so unknown rather than a crash.
        var r = Body("\u0660\u0664\u0660\u0660 FG");
        Assert.Null(r.Visibility);
        Assert.Single(r.UnknownGroups);
        Assert.Throws<MetarFormatException>(() => MetarDecoder.Decode("METAR XDMO \u0660\u0661\u0660\u0666\u0662\u0660Z 0400"));
    }

    [Fact]
    public void TooLongText_IsRefused()
    {
        var text = "METAR XDMO 010620Z " + string.Join(' ', Enumerable.Repeat("FG", 3000));
        Assert.Throws<MetarFormatException>(() => MetarDecoder.Decode(text));
    }
}
