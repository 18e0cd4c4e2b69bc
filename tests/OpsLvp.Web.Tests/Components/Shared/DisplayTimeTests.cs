using OpsLvp.Web.Components.Shared;

namespace OpsLvp.Web.Tests.Components.Shared;

/// <summary>UTC times with Z and readable spans (times are invented).</summary>
public class DisplayTimeTests
{
    [Fact]
    public void Clock_ShowsUtcWithZ_WhateverTheOffset()
    {
        var t = new DateTimeOffset(2026, 12, 1, 4, 12, 5, TimeSpan.FromHours(1));
        Assert.Equal(("03:12Z", "03:12:05Z"), (DisplayTime.Clock(t), DisplayTime.ClockSeconds(t)));
    }

    [Theory]
    [InlineData(-5, "0 s")]
    [InlineData(45.9, "45 s")]
    [InlineData(260, "4 min 20 s")]
    [InlineData(3900, "1 h 05 min")]
    public void Span_ReadsAsSecondsMinutesOrHours(double seconds, string expected)
    {
        Assert.Equal(expected, DisplayTime.Span(TimeSpan.FromSeconds(seconds)));
    }
}
