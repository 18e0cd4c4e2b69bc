using System.Globalization;
using System.Text.RegularExpressions;
using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Metar;

/// <summary>
/// Decodes the groups of a METAR or SPECI that low-visibility procedures need (WMO-No. 306, code forms FM 15/16):
/// report type, COR, AUTO, NIL, location indicator, time, visibility (metres, or statute miles as North American
/// reports write it), RVR and <c>RVRNO</c>, present weather, cloud and vertical visibility. Wind, temperature, QNH, runway state, wind shear and sea groups are recognised and skipped. The first
/// trend group (NOSIG, BECMG, TEMPO) or RMK ends the decoded part. Groups matching no known form are skipped and
/// listed in <see cref="MetarReport.UnknownGroups"/>. Input is matched case-insensitively; a trailing <c>=</c> is ignored.
/// </summary>
public static partial class MetarDecoder
{
    private const int MaxLength = 4096;

    /// <summary>Decodes <paramref name="text"/>.</summary>
    /// <exception cref="MetarFormatException">
    /// The text is empty, too long, or lacks the location indicator or a valid <c>YYGGggZ</c> time group.
    /// </exception>
    public static MetarReport Decode(string? text)
    {
        if (string.IsNullOrWhiteSpace(text))
        {
            throw new MetarFormatException("empty report: expected a METAR or SPECI such as 'METAR XDMO 010620Z 24004KT 0400 FG VV001'");
        }
        if (text.Length > MaxLength)
        {
            throw new MetarFormatException($"report too long ({text.Length} characters, at most {MaxLength})");
        }
        var groups = text.ToUpperInvariant()
            .Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
            .Select(g => g.TrimEnd('='))
            .Where(g => g.Length > 0)
            .ToList();
        return new Parser(groups).Parse();
    }

    /// <summary>Decodes <paramref name="text"/>, or returns false with the reason in <paramref name="error"/>.</summary>
    public static bool TryDecode(string? text, out MetarReport? report, out string? error)
    {
        try
        {
            report = Decode(text);
            error = null;
            return true;
        }
        catch (MetarFormatException ex)
        {
            report = null;
            error = ex.Message;
            return false;
        }
    }

    [GeneratedRegex(@"^[A-Z][A-Z0-9]{3}$")]
    private static partial Regex StationRegex();

    [GeneratedRegex(@"^([0-9]{2})([0-9]{2})([0-9]{2})Z$")]
    private static partial Regex TimeRegex();

    [GeneratedRegex(@"^([0-9]{4})(NDV)?$")]
    private static partial Regex VisibilityRegex();

    [GeneratedRegex(@"^////(NDV)?$")]
    private static partial Regex MissingVisibilityRegex();

    [GeneratedRegex(@"^([MP])?(?:([0-9]{1,2})|([0-9]{1,2})/([0-9]{1,2}))SM$")]
    private static partial Regex StatuteMilesRegex();

    [GeneratedRegex(@"^[0-9]{1,2}$")]
    private static partial Regex WholeMilesRegex();

    [GeneratedRegex(@"^[0-9]{1,2}/[0-9]{1,2}SM$")]
    private static partial Regex FractionMilesRegex();

    [GeneratedRegex(@"^([0-9]{4})(N|NE|E|SE|S|SW|W|NW)$")]
    private static partial Regex MinimumVisibilityRegex();

    [GeneratedRegex(@"^R([0-9]{2}[LCR]?)/(?:////|([MP])?([0-9]{4})(?:V([MP])?([0-9]{4}))?(FT)?/?([UDN])?)$")]
    private static partial Regex RvrRegex();

    [GeneratedRegex(@"^(R[0-9]{2}[LCR]?/([0-9/]{6}|CLRD[0-9/]{2})|R/SNOCLO|SNOCLO|[0-9]{8})$")]
    private static partial Regex RunwayStateRegex();

    [GeneratedRegex(@"^(RE)?(\+|-|VC)?(MI|BC|PR|DR|BL|SH|TS|FZ)?((?:DZ|RA|SN|SG|PL|GR|GS|UP|IC|BR|FG|FU|VA|DU|SA|HZ|PO|SQ|FC|SS|DS)*)$")]
    private static partial Regex WeatherRegex();

    [GeneratedRegex(@"^(M?[0-9]{2}|//)/(M?[0-9]{2}|//)?$")]
    private static partial Regex TemperatureRegex();

    [GeneratedRegex(@"^[QA]([0-9]{4}|////)$")]
    private static partial Regex PressureRegex();

    [GeneratedRegex(@"^W(M?[0-9]{2}|//)/(S[0-9/]|H[0-9]{1,3}|H///)$")]
    private static partial Regex SeaRegex();

    [GeneratedRegex(@"^(R[0-9]{2}[LCR]?|RWY[0-9]{2}[LCR]?)$")]
    private static partial Regex WindShearRunwayRegex();

    private sealed class Parser(List<string> groups)
    {
        private readonly List<string> _groups = groups;
        private readonly List<MetarRvr> _rvr = [];
        private readonly List<MetarWeather> _weather = [];
        private readonly List<MetarWeather> _recentWeather = [];
        private readonly List<MetarCloudLayer> _clouds = [];
        private readonly List<string> _unknown = [];
        private int _index;

        public MetarReport Parse()
        {
            MetarReportType? type = null;
            var corrected = false;
            if (Peek() is "METAR" or "SPECI")
            {
                type = Next() == "METAR" ? MetarReportType.Metar : MetarReportType.Speci;
            }
            while (Peek() is "COR" or "AMD")
            {
                corrected |= Next() == "COR";
            }

            var station = Peek();
            if (station is null)
            {
                throw new MetarFormatException("no location indicator: expected 4 letters (e.g. XDMO) after the report type");
            }
            if (!StationRegex().IsMatch(station))
            {
                throw new MetarFormatException($"'{station}' is not a location indicator: expected 4 letters (e.g. XDMO){(type is null ? " or METAR/SPECI" : "")}");
            }
            _index++;

            var time = ParseTime(Next(), station);

            var automatic = false;
            var nil = false;
            while (Peek() is "AUTO" or "COR" or "NIL")
            {
                switch (Next())
                {
                    case "AUTO":
                        automatic = true;
                        break;
                    case "COR":
                        corrected = true;
                        break;
                    default:
                        nil = true;
                        break;
                }
            }
            if (nil)
            {
                _unknown.AddRange(_groups.Skip(_index));
                return new MetarReport
                {
                    Type = type, Station = station, Time = time, Corrected = corrected, Automatic = automatic, Nil = true,
                    UnknownGroups = _unknown,
                };
            }

            Metres? visibility = null;
            MetarMinimumVisibility? minimum = null;
            var ndv = false;
            var visibilitySeen = false;
            var visibilityStatus = VisibilityStatus.Absent;
            var visibilityUnit = VisibilityUnit.Metres;
            VisibilityQualifier? visibilityQualifier = null;
            string? visibilityGroup = null;
            // True once a group that follows the visibility in FM 15 order (RVR, weather, cloud) was read: an unknown
            // group before that point stands where the visibility belongs.
            var pastVisibility = false;
            var rvrNotAvailable = false;
            var cloudNotObservable = false;
            var cavok = false;
            Feet? verticalVisibility = null;
            var obscured = false;
            string? sky = null;
            string? trend = null;
            string? remarks = null;

            while (Peek() is { } g)
            {
                _index++;
                Match m;
                if (g is "NOSIG" or "BECMG" or "TEMPO")
                {
                    trend = Rest(g, stopAtRemarks: true);
                    if (Peek() == "RMK")
                    {
                        _index++;
                        remarks = Rest(null, stopAtRemarks: false);
                    }
                    break;
                }
                if (g == "RMK")
                {
                    remarks = Rest(null, stopAtRemarks: false);
                    break;
                }
                if (g is "AUTO")
                {
                    automatic = true;
                }
                else if (g is "COR")
                {
                    corrected = true;
                }
                else if (g == "CAVOK")
                {
                    cavok = true;
                    visibility = new Metres(10_000);
                    visibilitySeen = true;
                    visibilityStatus = VisibilityStatus.Reported;
                    visibilityGroup = g;
                }
                else if (ReportGroups.IsWind(g))
                {
                    // Wind is not an LVP input: recognised and skipped.
                }
                else if (!visibilitySeen && (m = VisibilityRegex().Match(g)).Success)
                {
                    var value = Int(m.Groups[1].Value);
                    visibility = new Metres(value == 9999 ? 10_000 : value);
                    ndv = m.Groups[2].Success;
                    visibilitySeen = true;
                    visibilityStatus = VisibilityStatus.Reported;
                    visibilityGroup = g;
                }
                else if (!visibilitySeen && (m = MissingVisibilityRegex().Match(g)).Success)
                {
                    ndv = m.Groups[1].Success;
                    visibilitySeen = true;
                    visibilityStatus = VisibilityStatus.NotObserved;
                    visibilityGroup = g;
                }
                else if (!visibilitySeen && !pastVisibility && ReadStatuteMiles(g) is { } miles)
                {
                    (visibility, visibilityQualifier, visibilityGroup) = miles;
                    visibilityUnit = VisibilityUnit.StatuteMiles;
                    visibilitySeen = true;
                    visibilityStatus = VisibilityStatus.Reported;
                }
                else if (visibilitySeen && minimum is null && (m = MinimumVisibilityRegex().Match(g)).Success)
                {
                    minimum = new MetarMinimumVisibility(new Metres(Int(m.Groups[1].Value)), m.Groups[2].Value);
                }
                else if ((m = RvrRegex().Match(g)).Success)
                {
                    _rvr.Add(ToRvr(m));
                    pastVisibility = true;
                }
                else if (g == "RVRNO")
                {
                    // RVR should be reported but is not available (FAA FMH-1 — from memory).
                    rvrNotAvailable = true;
                    pastVisibility = true;
                }
                else if (RunwayStateRegex().IsMatch(g))
                {
                    // Runway state (deposit, braking action) is not decoded.
                }
                else if (g is "NSC" or "NCD" or "SKC" or "CLR")
                {
                    sky = g;
                    pastVisibility = true;
                }
                else if (ReportGroups.TryCloud(g, out var layer))
                {
                    pastVisibility = true;
                    if (layer is { Cover: null, Base: null, Type: null })
                    {
                        // "//////": cloud not observable by the automatic system; no layer to report, ceiling unknown.
                        cloudNotObservable = true;
                        continue;
                    }
                    // "//////CB" keeps its layer: a CB or TCU was detected, amount and height not determinable.
                    _clouds.Add(layer!);
                }
                else if (ReportGroups.TryVerticalVisibility(g, out var vv))
                {
                    obscured = true;
                    verticalVisibility = vv;
                    pastVisibility = true;
                }
                else if (g is "//" or "NSW")
                {
                    // "//" present weather not observable (AUTO); NSW belongs to trends but is harmless here.
                }
                else if ((m = WeatherRegex().Match(g)).Success && (m.Groups[3].Success || m.Groups[4].Length > 0))
                {
                    (m.Groups[1].Success ? _recentWeather : _weather).Add(ToWeather(m));
                    pastVisibility = true;
                }
                else if (TemperatureRegex().IsMatch(g) || PressureRegex().IsMatch(g) || SeaRegex().IsMatch(g))
                {
                    // Temperature, dew point, QNH and sea state are not LVP inputs.
                }
                else if (g == "WS")
                {
                    SkipWindShear();
                }
                else
                {
                    _unknown.Add(g);
                    if (!visibilitySeen && !pastVisibility && visibilityStatus == VisibilityStatus.Absent)
                    {
                        visibilityStatus = VisibilityStatus.Unreadable;
                        visibilityGroup = g;
                    }
                }
            }

            return new MetarReport
            {
                Type = type,
                Station = station,
                Time = time,
                Corrected = corrected,
                Automatic = automatic,
                Visibility = visibility,
                VisibilityStatus = visibilityStatus,
                VisibilityUnit = visibilityUnit,
                VisibilityQualifier = visibilityQualifier,
                VisibilityGroup = visibilityGroup,
                MinimumVisibility = minimum,
                NoDirectionalVariation = ndv,
                Cavok = cavok,
                Rvr = _rvr,
                RvrNotAvailable = rvrNotAvailable,
                Weather = _weather,
                RecentWeather = _recentWeather,
                Clouds = _clouds,
                CloudNotObservable = cloudNotObservable,
                VerticalVisibility = verticalVisibility,
                SkyObscured = obscured,
                SkyCondition = sky,
                Trend = trend,
                Remarks = remarks,
                UnknownGroups = _unknown,
            };
        }

        private string? Peek() => _index < _groups.Count ? _groups[_index] : null;

        /// <summary>
        /// A statute-mile visibility starting at the group just taken (<paramref name="g"/>): <c>3SM</c>, <c>1/4SM</c>,
        /// <c>M1/4SM</c>, <c>P6SM</c>, or a whole number followed by a fraction group (<c>1 1/2SM</c>, which then takes the
        /// next group too). Converted at 1609.344 m per mile (the international mile, exact) and rounded down to the
        /// whole metre, the conservative direction. Null when the group is no such form (or divides by zero).
        /// </summary>
        private (Metres Value, VisibilityQualifier? Qualifier, string Group)? ReadStatuteMiles(string g)
        {
            if (WholeMilesRegex().IsMatch(g) && Peek() is { } next && FractionMilesRegex().IsMatch(next)
                && ReadStatuteMiles(next, Int(g)) is { } mixed)
            {
                _index++;
                return (mixed.Value, mixed.Qualifier, g + " " + next);
            }
            return ReadStatuteMiles(g, 0) is { } plain ? (plain.Value, plain.Qualifier, g) : null;
        }

        private static (Metres Value, VisibilityQualifier? Qualifier)? ReadStatuteMiles(string g, int whole)
        {
            var m = StatuteMilesRegex().Match(g);
            if (!m.Success)
            {
                return null;
            }
            double miles;
            if (m.Groups[2].Success)
            {
                miles = Int(m.Groups[2].Value);
            }
            else
            {
                var denominator = Int(m.Groups[4].Value);
                if (denominator == 0)
                {
                    return null;
                }
                miles = (double)Int(m.Groups[3].Value) / denominator;
            }
            VisibilityQualifier? qualifier = m.Groups[1].Success
                ? m.Groups[1].Value == "M" ? VisibilityQualifier.LessThan : VisibilityQualifier.MoreThan
                : null;
            return (new Metres(Math.Floor((whole + miles) * MetarReport.MetresPerStatuteMile)), qualifier);
        }

        private string? Next() => _index < _groups.Count ? _groups[_index++] : null;

        private string Rest(string? first, bool stopAtRemarks)
        {
            var parts = new List<string>();
            if (first is not null)
            {
                parts.Add(first);
            }
            while (Peek() is { } g && !(stopAtRemarks && g == "RMK"))
            {
                parts.Add(g);
                _index++;
            }
            return string.Join(' ', parts);
        }

        private void SkipWindShear()
        {
            // WS Rdd, WS RWYdd, WS ALL RWY (WMO-No. 306 FM 15 supplementary information).
            if (Peek() == "ALL")
            {
                _index++;
                if (Peek() == "RWY")
                {
                    _index++;
                }
            }
            else if (Peek() is { } runway && WindShearRunwayRegex().IsMatch(runway))
            {
                _index++;
            }
        }

        private static MetarObservationTime ParseTime(string? group, string station)
        {
            if (group is null)
            {
                throw new MetarFormatException($"no time group after '{station}': expected day, hour and minute UTC as DDHHMMZ (e.g. 010620Z)");
            }
            var m = TimeRegex().Match(group);
            if (!m.Success)
            {
                throw new MetarFormatException($"'{group}' is not a time group: expected DDHHMMZ after '{station}' (e.g. 010620Z)");
            }
            var (day, hour, minute) = (Int(m.Groups[1].Value), Int(m.Groups[2].Value), Int(m.Groups[3].Value));
            if (day is < 1 or > 31 || hour > 23 || minute > 59)
            {
                throw new MetarFormatException($"time group '{group}' is out of range: day 01-31, hour 00-23, minute 00-59");
            }
            return new MetarObservationTime(day, hour, minute);
        }

        private static MetarRvr ToRvr(Match m)
        {
            var runway = m.Groups[1].Value;
            if (!m.Groups[3].Success)
            {
                return new MetarRvr(runway, null, null, RvrQualifier.None, RvrQualifier.None, null, RvrReportedUnit.Metres, null, null);
            }
            var feet = m.Groups[6].Success;
            var reported = Int(m.Groups[3].Value);
            int? reportedMax = m.Groups[5].Success ? Int(m.Groups[5].Value) : null;
            return new MetarRvr(
                runway,
                ToMetres(reported, feet),
                reportedMax is { } max ? ToMetres(max, feet) : null,
                Qualifier(m.Groups[2]),
                Qualifier(m.Groups[4]),
                m.Groups[7].Success ? m.Groups[7].Value switch
                {
                    "U" => RvrTendency.Up,
                    "D" => RvrTendency.Down,
                    _ => RvrTendency.NoChange,
                } : null,
                feet ? RvrReportedUnit.Feet : RvrReportedUnit.Metres,
                reported,
                reportedMax);
        }

        private static Metres ToMetres(int value, bool feet) =>
            new(feet ? Math.Floor(new Feet(value).ToMetres().Value) : value);

        private static RvrQualifier Qualifier(Group g) =>
            !g.Success ? RvrQualifier.None : g.Value == "M" ? RvrQualifier.Below : RvrQualifier.Above;

        private static MetarWeather ToWeather(Match m)
        {
            var phenomena = m.Groups[4].Value.Chunk(2).Select(c => new string(c)).ToList();
            var intensity = m.Groups[2].Success ? m.Groups[2].Value : null;
            var descriptor = m.Groups[3].Success ? m.Groups[3].Value : null;
            return new MetarWeather(intensity, descriptor, phenomena, intensity + descriptor + m.Groups[4].Value);
        }

        private static int Int(string digits) => int.Parse(digits, NumberStyles.None, CultureInfo.InvariantCulture);
    }
}
