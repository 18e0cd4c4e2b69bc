using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Reporting;

public sealed class RvrReportingTests
{
    [Theory]
    // Steps: 25 m below 400, 50 m from 400 to 800, 100 m above 800, rounded down — ICAO Annex 3, App 3, §4.3.6 (from memory)
    [InlineData(50.1, "0050")]
    [InlineData(74.9, "0050")]
    [InlineData(75.0, "0075")]
    [InlineData(75.1, "0075")]
    [InlineData(174.9, "0150")]
    [InlineData(175.0, "0175")]
    [InlineData(374.9, "0350")]
    [InlineData(375.0, "0375")]
    [InlineData(399.9, "0375")]
    // Exactly 400: on both the 25 m and the 50 m scale, reported as itself (boundary decided in RvrReporting)
    [InlineData(400.0, "0400")]
    [InlineData(400.1, "0400")]
    [InlineData(424.9, "0400")] // 50 m steps from 400: no 425 — ICAO Annex 3, App 3, §4.3.6 (from memory)
    [InlineData(449.9, "0400")]
    [InlineData(450.0, "0450")]
    [InlineData(549.9, "0500")]
    [InlineData(550.0, "0550")]
    [InlineData(799.9, "0750")]
    // Exactly 800: on both the 50 m and the 100 m scale, reported as itself (boundary decided in RvrReporting)
    [InlineData(800.0, "0800")]
    [InlineData(800.1, "0800")]
    [InlineData(849.9, "0800")] // 100 m steps above 800: no 850 — ICAO Annex 3, App 3, §4.3.6 (from memory)
    [InlineData(899.9, "0800")]
    [InlineData(900.0, "0900")]
    [InlineData(1499.9, "1400")]
    [InlineData(1999.9, "1900")]
    public void Rvr_WithinLimits_RoundsDownToTheStepInForce(double metres, string expected)
    {
        var report = RvrReporting.Report(new Metres(metres));

        Assert.Equal(expected, report.ToMetar());
        Assert.Equal(RvrQualifier.None, report.Qualifier);
        Assert.True(report.Reported.Value <= metres, $"{metres} m was reported as {report.Reported.Value} m");
    }

    [Theory]
    // Lower limit 50 m: below it "below 50", METAR M0050 — ICAO Annex 3, App 3, §4.3.6; WMO BUFR code table 0 08 014
    [InlineData(0.0)]
    [InlineData(10.0)]
    [InlineData(49.9)]
    [InlineData(49.999)]
    public void Rvr_BelowLowerLimit_ReportsM0050(double metres)
    {
        var report = RvrReporting.Report(new Metres(metres));

        Assert.Equal(RvrQualifier.Below, report.Qualifier);
        Assert.Equal(50, report.Reported.Value);
        Assert.Equal("M0050", report.ToMetar());
    }

    [Fact]
    public void Rvr_ExactlyAtLowerLimit_Reports0050WithoutQualifier()
    {
        // Limit inclusive (decided in RvrReporting): only values below 50 m are "below 50" — ICAO Annex 3, App 3, §4.3.6
        var report = RvrReporting.Report(new Metres(50));

        Assert.Equal(RvrQualifier.None, report.Qualifier);
        Assert.Equal("0050", report.ToMetar());
    }

    [Fact]
    public void Rvr_ExactlyAtUpperLimit_Reports2000WithoutQualifier()
    {
        // Limit inclusive (decided in RvrReporting): only values above 2000 m are "above 2000" — ICAO Annex 3, App 3, §4.3.6
        var report = RvrReporting.Report(new Metres(2000));

        Assert.Equal(RvrQualifier.None, report.Qualifier);
        Assert.Equal("2000", report.ToMetar());
    }

    [Theory]
    // Upper limit 2000 m: above it "above 2000", METAR P2000 — ICAO Annex 3, App 3, §4.3.6; WMO BUFR code table 0 08 014
    [InlineData(2000.1)]
    [InlineData(2099.9)]
    [InlineData(2100.0)]
    [InlineData(9000.0)]
    public void Rvr_AboveUpperLimit_ReportsP2000(double metres)
    {
        var report = RvrReporting.Report(new Metres(metres));

        Assert.Equal(RvrQualifier.Above, report.Qualifier);
        Assert.Equal(2000, report.Reported.Value);
        Assert.Equal("P2000", report.ToMetar());
    }

    [Theory]
    // Step in force — ICAO Annex 3, App 3, §4.3.6 (from memory); boundaries decided in RvrReporting
    [InlineData(399.9, 25)]
    [InlineData(400.0, 50)]
    [InlineData(800.0, 50)]
    [InlineData(800.1, 100)]
    public void StepAt_AroundStepBoundaries_GivesTheScaleStep(double metres, double expectedStep)
    {
        Assert.Equal(expectedStep, RvrReporting.StepAt(new Metres(metres)).Value);
    }

    [Theory]
    [InlineData(-0.1)]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    public void Rvr_NegativeOrNotFinite_IsRejectedWithAClearError(double metres)
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() => RvrReporting.Report(new Metres(metres)));
        Assert.Contains("RVR must be", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void RvrReport_QualifierOffItsLimit_IsRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new RvrReport(new Metres(60), RvrQualifier.Below));
        Assert.Throws<ArgumentOutOfRangeException>(() => new RvrReport(new Metres(1900), RvrQualifier.Above));
        Assert.Throws<ArgumentOutOfRangeException>(() => new RvrReport(new Metres(550.5), RvrQualifier.None));
    }
}
