using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>
/// How the wall shows a state: the words and glyph of <see cref="LvpVocabulary"/> (the one table every screen uses)
/// and a CSS class (colour plus a background pattern) from its tone, so the phase never rests on colour alone.
/// </summary>
/// <param name="Title">The dominant text, e.g. "LVP IN FORCE".</param>
/// <param name="Subtitle">One line saying what the state means.</param>
/// <param name="Glyph">A shape unique to the state.</param>
/// <param name="CssClass">Colour and pattern class on the phase band.</param>
public sealed record WallPhaseLook(string Title, string Subtitle, string Glyph, string CssClass)
{
    /// <summary>The look of the engine's status now (phase refined by its safeguards).</summary>
    public static WallPhaseLook For(EngineStatus status) => From(LvpVocabulary.For(status));

    /// <summary>The look of a phase seen without its safeguards.</summary>
    public static WallPhaseLook For(Phase phase) => From(LvpVocabulary.For(phase));

    /// <summary>Phase name for running text ("LVP preparation", "LVP in force").</summary>
    public static string ShortName(Phase phase) => LvpVocabulary.For(phase).Name;

    private static WallPhaseLook From(StateWords words) =>
        new(words.Headline, words.Meaning, words.Glyph, "wall-phase-" + words.Tone.ToString().ToLowerInvariant());
}
