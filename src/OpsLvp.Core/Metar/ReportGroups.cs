using OpsLvp.Core.Reporting;
using System.Globalization;
using System.Text.RegularExpressions;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>
/// Recognisers for the groups METAR/SPECI (WMO-No. 306 FM 15), their TREND and TAF (FM 51) share: wind, visibility in
/// metres or statute miles, present weather, cloud and vertical visibility. Groups are given upper-cased, without a
/// trailing <c>=</c>. Each method returns false (and leaves its output null) when the group is not of its form.
/// </summary>
internal static partial class ReportGroups
{
    /// <summary>1 statute mile = 1609.344 m exactly (international mile).</summary>
    public const double MetresPerStatuteMile = 1609.344;

    public static bool IsWind(string g) => WindRegex().IsMatch(g) || WindVariationRegex().IsMatch(g);

    /// <summary>
    /// <c>VVVV</c> in metres; <c>9999</c> means 10 km or more and gives 10 000 m with <see cref="RvrQualifier.Above"/>.
    /// </summary>
    public static bool TryMetricVisibility(string g, out ReportedVisibility? visibility)
    {
        visibility = null;
        var m = MetricVisibilityRegex().Match(g);
        if (!m.Success)
        {
            return false;
        }
        var value = Int(m.Groups[1].Value);
        visibility = value == 9999
            ? new ReportedVisibility(new Metres(10_000), RvrQualifier.Above, null)
            : new ReportedVisibility(new Metres(value), null, null);
        return true;
    }

    /// <summary>
    /// Statute miles: <c>[M|P]n[/d]SM</c> (<c>1/4SM</c>, <c>M1/4SM</c> less than, <c>P6SM</c> more than, <c>10SM</c>),
    /// or the whole miles <paramref name="g"/> followed by the fraction <paramref name="next"/> (<c>1 1/2SM</c>), in which
    /// case <paramref name="consumedNext"/> is true. Metres = miles × 1609.344 (FAA FMH-1 — from memory; the mile by
    /// international definition).
    /// </summary>
    public static bool TryStatuteMileVisibility(string g, string? next, out ReportedVisibility? visibility, out bool consumedNext)
    {
        visibility = null;
        consumedNext = false;
        if (next is not null && WholeMilesRegex().IsMatch(g) && FractionMilesRegex().Match(next) is { Success: true } fraction)
        {
            var miles = Int(g) + Fraction(fraction.Groups[1].Value, fraction.Groups[2].Value);
            if (miles is { } mi)
            {
                visibility = new ReportedVisibility(new Metres(mi * MetresPerStatuteMile), null, mi);
                consumedNext = true;
                return true;
            }
        }
        var m = StatuteMilesRegex().Match(g);
        if (!m.Success)
        {
            return false;
        }
        double? value = m.Groups[3].Success ? Fraction(m.Groups[2].Value, m.Groups[3].Value) : Int(m.Groups[2].Value);
        if (value is not { } v)
        {
            return false;
        }
        var qualifier = m.Groups[1].Value switch
        {
            "M" => RvrQualifier.Below,
            "P" => RvrQualifier.Above,
            _ => (RvrQualifier?)null,
        };
        visibility = new ReportedVisibility(new Metres(v * MetresPerStatuteMile), qualifier, v);
        return true;
    }

    /// <summary>
    /// Present weather <c>[+|-|VC][descriptor]phenomena</c> (WMO-No. 306 FM 15, code table 4678). A group with only an
    /// intensity and no descriptor or phenomenon is not weather.
    /// </summary>
    public static bool TryWeather(string g, out MetarWeather? weather)
    {
        weather = null;
        var m = WeatherRegex().Match(g);
        if (!m.Success || (!m.Groups[2].Success && m.Groups[3].Length == 0))
        {
            return false;
        }
        var phenomena = m.Groups[3].Value.Chunk(2).Select(c => new string(c)).ToList();
        var intensity = m.Groups[1].Success ? m.Groups[1].Value : null;
        var descriptor = m.Groups[2].Success ? m.Groups[2].Value : null;
        weather = new MetarWeather(intensity, descriptor, phenomena, intensity + descriptor + m.Groups[3].Value);
        return true;
    }

    /// <summary>Cloud <c>NNNhhh[CB|TCU]</c>, <c>hhh</c> in hundreds of feet; <c>///</c> parts give null.</summary>
    public static bool TryCloud(string g, out MetarCloudLayer? layer)
    {
        layer = null;
        var m = CloudRegex().Match(g);
        if (!m.Success)
        {
            return false;
        }
        CloudCover? cover = m.Groups[1].Value switch
        {
            "FEW" => CloudCover.Few,
            "SCT" => CloudCover.Scattered,
            "BKN" => CloudCover.Broken,
            "OVC" => CloudCover.Overcast,
            _ => null,
        };
        Feet? height = m.Groups[2].Value == "///" ? null : new Feet(Int(m.Groups[2].Value) * 100);
        CloudType? type = m.Groups[3].Value switch
        {
            "CB" => CloudType.Cumulonimbus,
            "TCU" => CloudType.ToweringCumulus,
            _ => null,
        };
        layer = new MetarCloudLayer(cover, height, type);
        return true;
    }

    /// <summary><c>VVhhh</c> in hundreds of feet; <c>VV///</c> matches with a null height.</summary>
    public static bool TryVerticalVisibility(string g, out Feet? height)
    {
        height = null;
        var m = VerticalVisibilityRegex().Match(g);
        if (!m.Success)
        {
            return false;
        }
        height = m.Groups[1].Value == "///" ? null : new Feet(Int(m.Groups[1].Value) * 100);
        return true;
    }

    private static double? Fraction(string numerator, string denominator)
    {
        var d = Int(denominator);
        return d == 0 ? null : (double)Int(numerator) / d;
    }

    private static int Int(string digits) => int.Parse(digits, NumberStyles.None, CultureInfo.InvariantCulture);

    [GeneratedRegex(@"^([0-9]{3}|VRB|///)([0-9]{2,3}|//)(G([0-9]{2,3}|//))?(KT|MPS|KMH)$")]
    private static partial Regex WindRegex();

    [GeneratedRegex(@"^[0-9]{3}V[0-9]{3}$")]
    private static partial Regex WindVariationRegex();

    [GeneratedRegex(@"^([0-9]{4})$")]
    private static partial Regex MetricVisibilityRegex();

    [GeneratedRegex(@"^([MP])?([0-9]{1,2})(?:/([0-9]{1,2}))?SM$")]
    private static partial Regex StatuteMilesRegex();

    [GeneratedRegex(@"^[0-9]$")]
    private static partial Regex WholeMilesRegex();

    [GeneratedRegex(@"^([0-9])/([0-9]{1,2})SM$")]
    private static partial Regex FractionMilesRegex();

    [GeneratedRegex(@"^(\+|-|VC)?(MI|BC|PR|DR|BL|SH|TS|FZ)?((?:DZ|RA|SN|SG|PL|GR|GS|UP|IC|BR|FG|FU|VA|DU|SA|HZ|PO|SQ|FC|SS|DS)*)$")]
    private static partial Regex WeatherRegex();

    [GeneratedRegex(@"^(FEW|SCT|BKN|OVC|///)([0-9]{3}|///)(CB|TCU|///)?$")]
    private static partial Regex CloudRegex();

    [GeneratedRegex(@"^VV([0-9]{3}|///)$")]
    private static partial Regex VerticalVisibilityRegex();
}
