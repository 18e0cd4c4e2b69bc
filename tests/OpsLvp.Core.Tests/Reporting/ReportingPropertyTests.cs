using CsCheck;
using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Reporting;

public sealed class ReportingPropertyTests
{
    private static readonly Gen<double> _rvr = Gen.Double[0, 3000];
    private static readonly Gen<double> _visibility = Gen.Double[0, 15_000];

    private static int Rank(RvrReport report) => report.Qualifier switch
    {
        RvrQualifier.Below => -1,
        RvrQualifier.Above => 3000,
        _ => (int)report.Reported.Value,
    };

    [Fact]
    public void RvrReporting_IsMonotone()
    {
        // Rounding down on a fixed scale cannot reverse order — ICAO Annex 3, App 3, §4.3.6 (from memory)
        Gen.Select(_rvr, _rvr).Sample((a, b) =>
        {
            var (lo, hi) = a <= b ? (a, b) : (b, a);
            return Rank(RvrReporting.Report(new Metres(lo))) <= Rank(RvrReporting.Report(new Metres(hi)));
        });
    }

    [Fact]
    public void RvrReporting_WithinLimits_NeverRoundsUpAndStaysWithinOneStep()
    {
        // Rounded down to the step in force — ICAO Annex 3, App 3, §4.3.6 (from memory)
        Gen.Double[50, 2000].Sample(v =>
        {
            var report = RvrReporting.Report(new Metres(v));
            var step = RvrReporting.StepAt(new Metres(v)).Value;
            return report.Qualifier == RvrQualifier.None
                && report.Reported.Value <= v
                && v - report.Reported.Value < step
                && report.Reported.Value % step == 0;
        });
    }

    [Fact]
    public void RvrReporting_OutsideLimits_AlwaysQualified()
    {
        // ICAO Annex 3, App 3, §4.3.6; WMO BUFR code table 0 08 014
        _rvr.Where(v => v < 50 || v > 2000).Sample(v =>
            RvrReporting.Report(new Metres(v)).Qualifier == (v < 50 ? RvrQualifier.Below : RvrQualifier.Above));
    }

    [Fact]
    public void VisibilityReporting_IsMonotoneAndNeverRoundsUp()
    {
        // ICAO Annex 3, App 3, §4.2 (from memory; also common practice)
        Gen.Select(_visibility, _visibility).Sample((a, b) =>
        {
            var (lo, hi) = a <= b ? (a, b) : (b, a);
            var rlo = VisibilityReporting.Report(new Metres(lo)).Reported.Value;
            var rhi = VisibilityReporting.Report(new Metres(hi)).Reported.Value;
            return rlo <= rhi && rlo <= lo && rhi <= hi;
        });
    }

    [Fact]
    public void VisibilityReporting_BelowTenKm_StaysWithinOneStep()
    {
        // ICAO Annex 3, App 3, §4.2 (from memory; also common practice)
        Gen.Double[0, 9999.999].Sample(v =>
        {
            var step = v < 800 ? 50 : v < 5000 ? 100 : 1000;
            var reported = VisibilityReporting.Report(new Metres(v)).Reported.Value;
            return v - reported < step && reported % step == 0;
        });
    }
}
