using System.Globalization;

namespace OpsLvp.Core.Engine;

/// <summary>Invariant formatting for reasons and status texts.</summary>
internal static class Fmt
{
    public static string N(double value) => value.ToString("0.#", CultureInfo.InvariantCulture);

    public static string Time(DateTimeOffset t) =>
        t.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.FFFFFFF'Z'", CultureInfo.InvariantCulture);

    /// <summary>"90 s" below two minutes, else whole minutes ("10 min").</summary>
    public static string Span(TimeSpan span) =>
        span.TotalSeconds < 120 ? $"{N(Math.Floor(span.TotalSeconds))} s" : $"{N(Math.Floor(span.TotalMinutes))} min";

    /// <summary>"6 of 10 min" or "20 of 30 s", in the unit of <paramref name="required"/>.</summary>
    public static string Of(TimeSpan held, TimeSpan required) =>
        required.TotalSeconds < 120
            ? $"{N(Math.Floor(held.TotalSeconds))} of {N(required.TotalSeconds)} s"
            : $"{N(Math.Floor(held.TotalMinutes))} of {N(Math.Round(required.TotalMinutes, 1))} min";

    /// <summary>The phase's machine code ("active"), for data fields (replay JSON), never for running text.</summary>
    public static string Name(Phase phase) => phase.ToString().ToLowerInvariant();

    /// <summary>
    /// A phase in running text, in the one vocabulary's words ("LVP in force"); a value outside the enum (bad input
    /// being refused) keeps its number rather than throwing.
    /// </summary>
    public static string Words(Phase phase) => Enum.IsDefined(phase) ? Presentation.LvpVocabulary.For(phase).Name : Name(phase);

    /// <summary>A change of phase in running text, in the one vocabulary's words ("LVP preparation to LVP in force"; never "->").</summary>
    public static string Change(Phase from, Phase to) => Presentation.LvpVocabulary.Change(from, to);
}
