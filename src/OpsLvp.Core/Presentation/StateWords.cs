namespace OpsLvp.Core.Presentation;

/// <summary>How one <see cref="LvpState"/> is called and drawn on every screen (wall, console, tablet, review, alarms, exports).</summary>
/// <param name="State">The state described.</param>
/// <param name="Name">The name in running text and on chips, e.g. "LVP in force".</param>
/// <param name="Headline">The wall's band text: <paramref name="Name"/> in capitals, e.g. "LVP IN FORCE".</param>
/// <param name="Meaning">One line saying what the state means for the airfield.</param>
/// <param name="Glyph">A shape unique to the state, so it never rests on colour alone.</param>
/// <param name="Tone">The colour family.</param>
/// <param name="Code">The stable lower-case word in files and APIs (exports, JSON): the engine phase name.</param>
public sealed record StateWords(LvpState State, string Name, string Headline, string Meaning, string Glyph, PhaseTone Tone, string Code);
