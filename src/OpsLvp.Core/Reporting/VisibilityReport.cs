using System.Globalization;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Reporting;

/// <summary>
/// A visibility as reported, in whole metres from 0 to 10 000 (10 000 means "10 km or more").
/// Build one with <see cref="VisibilityReporting.Report"/>; the constructor only checks shape.
/// </summary>
public readonly record struct VisibilityReport
{
    /// <summary>Throws <see cref="ArgumentOutOfRangeException"/> unless a whole number of metres from 0 to 10 000.</summary>
    public VisibilityReport(Metres reported)
    {
        var v = reported.Value;
        if (!double.IsFinite(v) || v < 0 || v > VisibilityReporting.TenKilometres.Value || v != Math.Floor(v))
        {
            throw new ArgumentOutOfRangeException(nameof(reported), v, "reported visibility must be a whole number of metres from 0 to 10000");
        }
        Reported = reported;
    }

    /// <summary>The reported visibility in metres; 10 000 stands for 10 km or more.</summary>
    public Metres Reported { get; }

    /// <summary>Whether this is the "10 km or more" report.</summary>
    public bool IsTenKilometresOrMore => Reported.Value >= VisibilityReporting.TenKilometres.Value;

    /// <summary>The METAR <c>VVVV</c> group: four digits in metres, <c>9999</c> for 10 km or more (WMO-No. 306, FM 15).</summary>
    public string ToMetar() => IsTenKilometresOrMore
        ? "9999"
        : ((int)Reported.Value).ToString("0000", CultureInfo.InvariantCulture);

    /// <inheritdoc />
    public override string ToString() => ToMetar();
}
