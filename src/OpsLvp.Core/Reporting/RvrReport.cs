using System.Globalization;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Reporting;

/// <summary>
/// An RVR as reported: a value on the Annex 3 reporting scale, or a reporting limit with a qualifier.
/// Build one with <see cref="RvrReporting.Report"/>; the constructor only checks shape.
/// </summary>
public readonly record struct RvrReport
{
    /// <summary>
    /// Throws <see cref="ArgumentOutOfRangeException"/> if <paramref name="reported"/> is negative, not a whole
    /// number of metres, above 9999 m, or a qualifier does not sit on its limit (Below → 50 m, Above → 2000 m).
    /// </summary>
    public RvrReport(Metres reported, RvrQualifier qualifier)
    {
        var v = reported.Value;
        if (!double.IsFinite(v) || v < 0 || v > 9999 || v != Math.Floor(v))
        {
            throw new ArgumentOutOfRangeException(nameof(reported), v, "reported RVR must be a whole number of metres from 0 to 9999");
        }
        if ((qualifier == RvrQualifier.Below && v != RvrReporting.LowerLimit.Value)
            || (qualifier == RvrQualifier.Above && v != RvrReporting.UpperLimit.Value))
        {
            throw new ArgumentOutOfRangeException(nameof(qualifier), qualifier, $"qualifier {qualifier} requires the matching reporting limit, not {v} m");
        }
        Reported = reported;
        Qualifier = qualifier;
    }

    /// <summary>The reported value in metres (for <see cref="RvrQualifier.Below"/>/<see cref="RvrQualifier.Above"/>, the limit).</summary>
    public Metres Reported { get; }

    /// <summary>Whether <see cref="Reported"/> is a limit.</summary>
    public RvrQualifier Qualifier { get; }

    /// <summary>The METAR/SPECI RVR value group without runway or tendency: <c>"0550"</c>, <c>"M0050"</c>, <c>"P2000"</c>.</summary>
    public string ToMetar()
    {
        var prefix = Qualifier switch
        {
            RvrQualifier.Below => "M",
            RvrQualifier.Above => "P",
            _ => "",
        };
        return prefix + ((int)Reported.Value).ToString("0000", CultureInfo.InvariantCulture);
    }

    /// <inheritdoc />
    public override string ToString() => ToMetar();
}
