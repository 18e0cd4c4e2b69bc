using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Reporting;

public sealed class VisibilityReportingTests
{
    [Theory]
    // Steps: 50 m below 800; 100 m from 800 to below 5 km; 1 km from 5 km to below 10 km; rounded down —
    // ICAO Annex 3, App 3, §4.2 (from memory; also common practice). METAR VVVV four digits — WMO-No. 306, FM 15
    [InlineData(0.0, "0000")]
    [InlineData(49.9, "0000")]
    [InlineData(50.0, "0050")]
    [InlineData(99.9, "0050")]
    [InlineData(100.0, "0100")]
    [InlineData(799.9, "0750")]
    [InlineData(800.0, "0800")]
    [InlineData(800.1, "0800")]
    [InlineData(850.0, "0800")] // 100 m steps from 800: no 850
    [InlineData(899.9, "0800")]
    [InlineData(900.0, "0900")]
    [InlineData(1550.0, "1500")]
    [InlineData(4999.9, "4900")]
    [InlineData(5000.0, "5000")]
    [InlineData(5000.1, "5000")]
    [InlineData(5999.9, "5000")]
    [InlineData(6000.0, "6000")]
    [InlineData(9999.9, "9000")]
    public void Visibility_BelowTenKm_RoundsDownToTheStepInForce(double metres, string expected)
    {
        var report = VisibilityReporting.Report(new Metres(metres));

        Assert.Equal(expected, report.ToMetar());
        Assert.False(report.IsTenKilometresOrMore);
        Assert.True(report.Reported.Value <= metres);
    }

    [Theory]
    // 10 km or more is reported as 10 km, METAR 9999 — ICAO Annex 3, App 3, §4.2 (from memory); WMO-No. 306, FM 15
    [InlineData(10_000.0)]
    [InlineData(10_000.1)]
    [InlineData(45_000.0)]
    public void Visibility_TenKmOrMore_Reports9999(double metres)
    {
        var report = VisibilityReporting.Report(new Metres(metres));

        Assert.True(report.IsTenKilometresOrMore);
        Assert.Equal(10_000, report.Reported.Value);
        Assert.Equal("9999", report.ToMetar());
    }

    [Theory]
    [InlineData(-1.0)]
    [InlineData(double.NaN)]
    public void Visibility_NegativeOrNotFinite_IsRejected(double metres)
    {
        var ex = Assert.Throws<ArgumentOutOfRangeException>(() => VisibilityReporting.Report(new Metres(metres)));
        Assert.Contains("visibility must be", ex.Message, StringComparison.Ordinal);
    }
}
