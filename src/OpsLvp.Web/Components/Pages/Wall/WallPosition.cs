namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>One RVR position tile.</summary>
/// <param name="Position">"TDZ", "MID" or "END".</param>
/// <param name="ValueText">The latest value in metres ("550"), or a dash when none is usable.</param>
/// <param name="MeanText">"1-min 560 m", empty when unknown.</param>
/// <param name="TrendArrow">"↑", "↓", "→" or empty.</param>
/// <param name="TrendText">"rising", "falling", "steady" or empty.</param>
/// <param name="StateText">"fresh 20 s", "STALE 3 min", "OUT OF SERVICE", "no sensor", "no reading yet".</param>
/// <param name="CssClass">State class of the tile.</param>
/// <param name="Lowest">The lowest usable value on the wall (ties all marked).</param>
/// <param name="Governing">The position counts for the governing RVR.</param>
/// <param name="Value">The usable value in metres, null when stale, out of service or missing.</param>
public sealed record WallPosition(
    string Position,
    string ValueText,
    string MeanText,
    string TrendArrow,
    string TrendText,
    string StateText,
    string CssClass,
    bool Lowest,
    bool Governing,
    double? Value);
