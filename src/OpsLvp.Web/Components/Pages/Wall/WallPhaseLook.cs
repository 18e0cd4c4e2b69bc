using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>
/// How the wall shows a phase: words, a glyph and a CSS class (colour plus a background pattern), so the phase
/// never rests on colour alone. Wording and look are OpsLvp's own.
/// </summary>
/// <param name="Title">The dominant text, e.g. "LVP IN FORCE"; short enough for one line at 9vh.</param>
/// <param name="Subtitle">One line saying what the phase means.</param>
/// <param name="Glyph">A shape unique to the phase.</param>
/// <param name="CssClass">Colour and pattern class on the phase band.</param>
public sealed record WallPhaseLook(string Title, string Subtitle, string Glyph, string CssClass)
{
    public static WallPhaseLook For(Phase phase) => phase switch
    {
        Phase.Normal => new("NORMAL", "normal operations, no low-visibility measures", "○", "wall-phase-normal"),
        Phase.Preparation => new("PREPARING LVP", "safeguarding the airfield while conditions deteriorate", "△", "wall-phase-preparation"),
        Phase.Active => new("LVP IN FORCE", "low-visibility procedures in force", "■", "wall-phase-active"),
        Phase.Cancellation => new("CANCELLING LVP", "LVP cancelled, protective measures being withdrawn", "▽", "wall-phase-cancellation"),
        _ => throw new ArgumentOutOfRangeException(nameof(phase), phase, "unknown phase"),
    };

    /// <summary>Short phase name for running text ("preparation", "LVP in force").</summary>
    public static string ShortName(Phase phase) => phase switch
    {
        Phase.Normal => "normal",
        Phase.Preparation => "preparation",
        Phase.Active => "LVP in force",
        Phase.Cancellation => "cancellation",
        _ => throw new ArgumentOutOfRangeException(nameof(phase), phase, "unknown phase"),
    };
}
