namespace OpsLvp.Core.Forecast;

/// <summary>The change indicator of a TAF change group (WMO-No. 306 FM 51) or a TREND (FM 15).</summary>
public enum ForecastChangeKind
{
    /// <summary><c>BECMG</c>: a change that becomes established during the window and then lasts.</summary>
    Becoming,
    /// <summary><c>TEMPO</c>: temporary fluctuations within the window (with <see cref="ForecastChange.Probability"/> for <c>PROB30 TEMPO</c>).</summary>
    Temporary,
    /// <summary><c>FM</c> (TAF): from this time the forecast is replaced by the group.</summary>
    From,
    /// <summary><c>PROB30</c>/<c>PROB40</c> alone: the group's conditions have that probability in the window.</summary>
    Probability,
    /// <summary><c>NOSIG</c> (TREND): no significant change expected.</summary>
    NoSignificantChange,
}
