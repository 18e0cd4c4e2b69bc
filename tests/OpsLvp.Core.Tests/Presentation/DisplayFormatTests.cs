using OpsLvp.Core.Presentation;

namespace OpsLvp.Core.Tests.Presentation;

public sealed class DisplayFormatTests
{
    [Theory]
    [InlineData(0, "0 s")]
    [InlineData(45.9, "45 s")]
    [InlineData(60, "1 min")]
    [InlineData(260, "4 min 20 s")]
    [InlineData(3599, "59 min 59 s")]
    [InlineData(3600 + 5 * 60 + 30, "1 h 05 min")]
    [InlineData(86_400 + 3 * 3600 + 59, "1 d 3 h")]
    public void Duration_ReadsInWholeUnits_RoundedDown(double seconds, string expected)
    {
        Assert.Equal(expected, DisplayFormat.Duration(TimeSpan.FromSeconds(seconds)));
    }

    [Fact]
    public void Duration_OfANegativeSpan_ReadsZero_ButSignedDurationKeepsTheSign()
    {
        Assert.Equal("0 s", DisplayFormat.Duration(TimeSpan.FromSeconds(-3)));
        Assert.Equal("−1 min 5 s", DisplayFormat.SignedDuration(TimeSpan.FromSeconds(-65)));
        Assert.Equal("1 min 5 s", DisplayFormat.SignedDuration(TimeSpan.FromSeconds(65)));
    }

    [Fact]
    public void Times_AreUtcWithZ_WhateverTheOffsetOfTheInstant()
    {
        var t = new DateTimeOffset(2026, 12, 1, 4, 12, 5, TimeSpan.FromHours(1)); // 03:12:05Z
        Assert.Equal("03:12Z", DisplayFormat.UtcClock(t));
        Assert.Equal("03:12:05Z", DisplayFormat.UtcClockSeconds(t));
        Assert.Equal("2026-12-01 03:12:05Z", DisplayFormat.UtcDateTime(t));
        Assert.Equal("2026-12-01 03:12Z", DisplayFormat.UtcDateMinutes(t));
    }

    [Fact]
    public void LocalClock_InAKnownZone_ConvertsAndInAnUnknownZone_IsNull()
    {
        var t = new DateTimeOffset(2026, 12, 1, 3, 12, 5, TimeSpan.Zero);
        Assert.Equal("03:12:05", DisplayFormat.LocalClockSeconds(t, "UTC"));
        Assert.Null(DisplayFormat.LocalClockSeconds(t, "Nowhere/Invented"));
    }

    [Theory]
    // Reporting limits 50 m and 2000 m, inclusive (ICAO Annex 3, App 3, §4.3.6)
    [InlineData(550, "550 m")]
    [InlineData(2000, "2000 m")]
    [InlineData(2000.1, "above 2000 m")]
    [InlineData(2500, "above 2000 m")]
    [InlineData(50, "50 m")]
    [InlineData(49.9, "below 50 m")]
    public void Rvr_OutsideTheReportableRange_SaysAboveOrBelowTheLimit(double metres, string expected)
    {
        Assert.Equal(expected, DisplayFormat.Rvr(metres));
    }

    [Fact]
    public void Rvr_TakesTheAerodromesOwnUpperLimit()
    {
        // 1500 m: an invented local limit.
        Assert.Equal("above 1500", DisplayFormat.RvrNumber(1800, 1500));
        Assert.Equal("1200", DisplayFormat.RvrNumber(1200, 1500));
    }

    [Fact]
    public void Units_AreWrittenAfterAWholeNumber()
    {
        Assert.Equal("200 ft", DisplayFormat.Feet(199.6));
        Assert.Equal("1000 m", DisplayFormat.Metres(1000));
    }
}
