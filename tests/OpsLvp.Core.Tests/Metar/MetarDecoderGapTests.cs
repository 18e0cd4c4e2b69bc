using System.Text.Json.Nodes;
using OpsLvp.Core.Metar;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// Issue 11 §5: statute-mile visibility, RVRNO, VV///, //////CB, unreadable groups. Forms from docs/sources.md "METAR/SPECI
/// groups" (statute miles and RVRNO: FAA FMH-1 — from memory; 1 statute mile = 1609.344 m exactly, the international
/// mile). Station XDMO and all values are invented.
/// </summary>
public sealed class MetarDecoderGapTests
{
    private static MetarReport Body(string groups) => MetarDecoder.Decode("METAR XDMO 010620Z 24004KT " + groups);

    private static JsonObject Json(string groups) => JsonNode.Parse(MetarJson.Write(Body(groups)))!.AsObject();

    [Theory]
    // 1/4 × 1609.344 = 402.336 → 402 (rounded down to the metre)
    [InlineData("1/4SM", 402)]
    // 1/2 × 1609.344 = 804.672 → 804
    [InlineData("1/2SM", 804)]
    // 1.5 × 1609.344 = 2414.016 → 2414
    [InlineData("1 1/2SM", 2414)]
    // 3 × 1609.344 = 4828.032 → 4828
    [InlineData("3SM", 4828)]
    // 10 × 1609.344 = 16093.44 → 16093
    [InlineData("10SM", 16_093)]
    public void StatuteMiles_AreDecodedToWholeMetresRoundedDown(string group, double metres)
    {
        var r = Body(group + " BR OVC005");
        Assert.Equal(new Metres(metres), r.Visibility);
        Assert.Equal(VisibilityUnit.StatuteMiles, r.VisibilityUnit);
        Assert.Equal(VisibilityStatus.Reported, r.VisibilityStatus);
        Assert.Equal(group, r.VisibilityGroup);
        Assert.Null(r.VisibilityQualifier);
        Assert.Empty(r.UnknownGroups);
    }

    [Fact]
    public void StatuteMiles_LessThan_KeepsTheQualifier()
    {
        var r = Body("M1/4SM FG VV001");
        Assert.Equal(new Metres(402), r.Visibility);
        Assert.Equal(VisibilityQualifier.LessThan, r.VisibilityQualifier);
        var json = Json("M1/4SM FG VV001");
        Assert.Equal(402, json["visibility_m"]!.GetValue<double>());
        Assert.Equal("M", json["visibility_qualifier"]!.GetValue<string>());
        Assert.Equal("SM", json["visibility_unit"]!.GetValue<string>());
    }

    [Fact]
    public void StatuteMiles_MixedNumber_TakesBothGroupsAndNotTheWholeNumberAlone()
    {
        var r = Body("2 3/4SM BR BKN008");
        // 2.75 × 1609.344 = 4425.696 → 4425
        Assert.Equal(new Metres(4425), r.Visibility);
        Assert.Equal("2 3/4SM", r.VisibilityGroup);
        Assert.Equal(new Feet(800), r.Ceiling);
    }

    [Fact]
    public void StatuteMiles_ZeroDenominator_IsAnUnreadableVisibility()
    {
        var r = Body("1/0SM FG OVC002");
        Assert.Null(r.Visibility);
        Assert.Equal(VisibilityStatus.Unreadable, r.VisibilityStatus);
        Assert.Equal(["1/0SM"], r.UnknownGroups);
    }

    [Fact]
    public void UnreadableVisibility_IsNeverSilentlyNull()
    {
        var json = Json("04O0 FG OVC002");
        Assert.Null(json["visibility_m"]);
        Assert.Equal("unreadable", json["visibility_status"]!.GetValue<string>());
        Assert.Equal("04O0", json["visibility_group"]!.GetValue<string>());
        Assert.Equal(["04O0"], json["unknown_groups"]!.AsArray().Select(n => n!.GetValue<string>()));
    }

    [Theory]
    [InlineData("//// FG VV001", "not_observed")]
    [InlineData("FEW010 10/08 Q1020", "absent")]
    [InlineData("0400 FG VV001", "reported")]
    [InlineData("CAVOK", "reported")]
    public void VisibilityStatus_SaysWhyTheValueIsOrIsNotThere(string groups, string status)
    {
        Assert.Equal(status, Json(groups)["visibility_status"]!.GetValue<string>());
    }

    [Fact]
    public void UnknownGroupAfterTheCloud_IsNotTakenForTheVisibility()
    {
        var r = Body("0400 FG OVC002 XYZ123");
        Assert.Equal(VisibilityStatus.Reported, r.VisibilityStatus);
        Assert.Equal(["XYZ123"], r.UnknownGroups);
    }

    [Fact]
    public void Rvrno_SetsRvrNotAvailableAndIsNotUnknown()
    {
        var r = Body("1/4SM RVRNO FG VV001");
        Assert.True(r.RvrNotAvailable);
        Assert.Empty(r.Rvr);
        Assert.Empty(r.UnknownGroups);
        Assert.True(Json("1/4SM RVRNO FG VV001")["rvr_not_available"]!.GetValue<bool>());
        Assert.False(Json("0400 FG VV001")["rvr_not_available"]!.GetValue<bool>());
    }

    [Fact]
    public void VerticalVisibilityNotDeterminable_IsCeilingUnknownNotNone()
    {
        var unknown = Json("0150 FG VV///");
        Assert.Null(unknown["ceiling_ft"]);
        Assert.Equal("unknown", unknown["ceiling_status"]!.GetValue<string>());
        var none = Json("9999 NSC");
        Assert.Null(none["ceiling_ft"]);
        Assert.Equal("none", none["ceiling_status"]!.GetValue<string>());
        Assert.Equal("reported", Json("0150 FG VV001")["ceiling_status"]!.GetValue<string>());
    }

    [Theory]
    [InlineData("4000 BR //////", CeilingStatus.Unknown)]
    [InlineData("4000 BR BKN/// OVC030", CeilingStatus.Unknown)]
    [InlineData("4000 BR ///004 OVC030", CeilingStatus.Unknown)]
    [InlineData("4000 BR OVC030 ///040", CeilingStatus.Reported)]
    [InlineData("4000 BR FEW010 SCT020", CeilingStatus.None)]
    [InlineData("4000 BR", CeilingStatus.Unknown)]
    [InlineData("CAVOK", CeilingStatus.None)]
    public void CeilingStatus_IsUnknownWheneverAHiddenLayerCouldBeLower(string groups, CeilingStatus expected)
    {
        // Ceiling: lowest BKN/OVC below 20 000 ft (ICAO/EASA definition of ceiling); a layer whose amount or height
        // cannot be told could be that layer (common practice: fail towards caution).
        Assert.Equal(expected, Body(groups).CeilingStatus);
    }

    [Fact]
    public void NilReport_HasUnknownCeiling()
    {
        Assert.Equal(CeilingStatus.Unknown, MetarDecoder.Decode("METAR XDMO 010620Z NIL").CeilingStatus);
    }

    [Fact]
    public void NotObservableCloudWithCb_KeepsTheCbLayerWithUnknownAmountAndHeight()
    {
        var r = Body("4000 BR //////CB");
        var layer = Assert.Single(r.Clouds);
        Assert.Null(layer.Cover);
        Assert.Null(layer.Base);
        Assert.Equal(CloudType.Cumulonimbus, layer.Type);
        Assert.Null(r.Ceiling);
        Assert.Equal(CeilingStatus.Unknown, r.CeilingStatus);
        Assert.Equal("""[{"cover":null,"base_ft":null,"type":"CB"}]""", Json("4000 BR //////CB")["clouds"]!.ToJsonString());
    }

    [Fact]
    public void NotObservableCloudWithoutType_GivesNoLayerButSaysSo()
    {
        var r = Body("4000 BR //////");
        Assert.Empty(r.Clouds);
        Assert.True(r.CloudNotObservable);
    }
}
