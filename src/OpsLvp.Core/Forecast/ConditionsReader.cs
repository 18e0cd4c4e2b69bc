using OpsLvp.Core.Reporting;
using System.Text.RegularExpressions;
using OpsLvp.Core.Metar;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// Reads the forecast elements of a base forecast or change group from a list of groups, up to the next change
/// indicator (<see cref="IsChangeStart"/>) or <c>RMK</c>. Shared by <see cref="TafDecoder"/> and <see cref="TrendDecoder"/>.
/// </summary>
internal sealed partial class ConditionsReader(IReadOnlyList<string> groups, List<string> unknown)
{
    private readonly IReadOnlyList<string> _groups = groups;
    private readonly List<string> _unknown = unknown;

    public int Index { get; set; }

    public string? Peek(int ahead = 0) => Index + ahead < _groups.Count ? _groups[Index + ahead] : null;

    public bool AtEnd => Index >= _groups.Count;

    /// <summary>True when <paramref name="g"/> starts a change group (or NOSIG) or the remarks.</summary>
    public static bool IsChangeStart(string g) =>
        g is "BECMG" or "TEMPO" or "NOSIG" or "RMK" || ProbabilityRegex().IsMatch(g) || FromTimeRegex().IsMatch(g);

    /// <summary>Reads elements until a change indicator, RMK or the end.</summary>
    public ForecastConditions Read()
    {
        ReportedVisibility? visibility = null;
        var cavok = false;
        var weather = new List<MetarWeather>();
        var nsw = false;
        var clouds = new List<MetarCloudLayer>();
        Feet? vv = null;
        var obscured = false;
        string? sky = null;
        while (Peek() is { } g && !IsChangeStart(g))
        {
            Index++;
            if (g == "CAVOK")
            {
                cavok = true;
                visibility = new ReportedVisibility(new Metres(10_000), RvrQualifier.Above, null);
            }
            else if (ReportGroups.IsWind(g))
            {
                // Wind is not an LVP input.
            }
            else if (visibility is null && ReportGroups.TryMetricVisibility(g, out var metric))
            {
                visibility = metric;
            }
            else if (visibility is null && ReportGroups.TryStatuteMileVisibility(g, Peek(), out var miles, out var consumed))
            {
                visibility = miles;
                Index += consumed ? 1 : 0;
            }
            else if (g is "NSC" or "SKC" or "NCD" or "CLR")
            {
                sky = g;
            }
            else if (g == "NSW")
            {
                nsw = true;
            }
            else if (ReportGroups.TryCloud(g, out var layer))
            {
                if (layer!.Cover is not null || layer.Base is not null)
                {
                    clouds.Add(layer);
                }
            }
            else if (ReportGroups.TryVerticalVisibility(g, out var height))
            {
                obscured = true;
                vv = height;
            }
            else if (ReportGroups.TryWeather(g, out var w))
            {
                weather.Add(w!);
            }
            else if (SkippedRegex().IsMatch(g))
            {
                // Temperature (TX/TN), wind shear, QNH, icing and turbulence groups are not LVP inputs.
            }
            else
            {
                _unknown.Add(g);
            }
        }
        return new ForecastConditions
        {
            Visibility = visibility,
            Cavok = cavok,
            Weather = weather,
            NoSignificantWeather = nsw,
            Clouds = clouds,
            VerticalVisibility = vv,
            SkyObscured = obscured,
            SkyCondition = sky,
        };
    }

    [GeneratedRegex(@"^PROB(30|40)$")]
    public static partial Regex ProbabilityRegex();

    [GeneratedRegex(@"^FM([0-9]{2})([0-9]{2})([0-9]{2})$")]
    public static partial Regex FromTimeRegex();

    [GeneratedRegex(@"^(T[XN]M?[0-9]{2}/[0-9]{4}Z|WS[0-9]{3}/[0-9]{3}[0-9]{2,3}(KT|MPS)|QNH[0-9]{4}INS|[56][0-9]{5}|AUTO)$")]
    private static partial Regex SkippedRegex();
}
