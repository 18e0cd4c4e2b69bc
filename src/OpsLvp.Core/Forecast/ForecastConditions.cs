using OpsLvp.Core.Metar;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Forecast;

/// <summary>
/// The elements a base forecast or change group states (WMO-No. 306 FM 51 / FM 15). An element the group does not
/// mention is null or empty and unchanged from what was forecast before it. <c>CAVOK</c> sets
/// <see cref="Visibility"/> to 10 000 m (or more) and states no cloud or weather of operational significance.
/// </summary>
public sealed record ForecastConditions
{
    /// <summary>Ceiling layers must lie below this height (ICAO/EASA definition of ceiling).</summary>
    public static readonly Feet CeilingLimit = MetarReport.CeilingLimit;

    public ReportedVisibility? Visibility { get; init; }

    public bool Cavok { get; init; }

    public IReadOnlyList<MetarWeather> Weather { get; init; } = [];

    /// <summary><c>NSW</c>: the forecast significant weather ends.</summary>
    public bool NoSignificantWeather { get; init; }

    public IReadOnlyList<MetarCloudLayer> Clouds { get; init; } = [];

    /// <summary><c>VVhhh</c> in feet; null if absent or <c>VV///</c>.</summary>
    public Feet? VerticalVisibility { get; init; }

    /// <summary>True for <c>VVhhh</c> or <c>VV///</c>: the sky is forecast obscured.</summary>
    public bool SkyObscured { get; init; }

    /// <summary><c>NSC</c>, <c>SKC</c>, <c>NCD</c> or <c>CLR</c> when stated, else null.</summary>
    public string? SkyCondition { get; init; }

    /// <summary>True when the group says anything about cloud: a layer, VV, NSC/SKC, or CAVOK.</summary>
    public bool StatesCloud => Cavok || SkyObscured || SkyCondition is not null || Clouds.Count > 0;

    /// <summary>True when the group states a visibility (a value or CAVOK).</summary>
    public bool StatesVisibility => Cavok || Visibility is not null;

    /// <summary>
    /// Ceiling: the lowest BKN or OVC base below <see cref="CeilingLimit"/>, or the vertical visibility when
    /// <paramref name="countVerticalVisibility"/> (local practice), whichever is lower; null if neither.
    /// </summary>
    public Feet? FindCeiling(bool countVerticalVisibility)
    {
        var layer = Clouds.Where(c => c.CoversMoreThanHalf && c.Base is { } b && b < CeilingLimit)
            .Select(c => c.Base).Min(b => b?.Value);
        var vv = countVerticalVisibility ? VerticalVisibility?.Value : null;
        double? lowest = layer is { } l && vv is { } v ? Math.Min(l, v) : layer ?? vv;
        return lowest is { } x ? new Feet(x) : null;
    }

    /// <summary>
    /// What prevails after this group is applied on top of <paramref name="before"/> (a <c>BECMG</c> changes only the
    /// elements it names): visibility, weather and cloud are each taken from this group when it states them.
    /// </summary>
    public ForecastConditions Over(ForecastConditions before)
    {
        ArgumentNullException.ThrowIfNull(before);
        if (Cavok)
        {
            return this;
        }
        var weatherStated = Weather.Count > 0 || NoSignificantWeather;
        return new ForecastConditions
        {
            Visibility = StatesVisibility ? Visibility : before.Visibility,
            Cavok = false,
            Weather = weatherStated ? Weather : before.Cavok ? [] : before.Weather,
            NoSignificantWeather = weatherStated ? NoSignificantWeather : before.NoSignificantWeather,
            Clouds = StatesCloud ? Clouds : before.Cavok ? [] : before.Clouds,
            VerticalVisibility = StatesCloud ? VerticalVisibility : before.VerticalVisibility,
            SkyObscured = StatesCloud ? SkyObscured : before.SkyObscured,
            SkyCondition = StatesCloud ? SkyCondition : before.Cavok ? "NSC" : before.SkyCondition,
        };
    }
}
