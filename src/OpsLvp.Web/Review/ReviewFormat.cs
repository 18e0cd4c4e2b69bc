using OpsLvp.Core.Presentation;

namespace OpsLvp.Web.Review;

/// <summary>The review pages' names for the shared formatters (<see cref="DisplayFormat"/>) and the one vocabulary (<see cref="LvpVocabulary"/>).</summary>
public static class ReviewFormat
{
    public static string Time(DateTimeOffset t) => DisplayFormat.UtcDateTime(t);

    public static string Clock(DateTimeOffset t) => DisplayFormat.UtcClockSeconds(t);

    /// <summary>"1 h 01 min", "12 min 5 s", "40 s"; a minus sign when negative.</summary>
    public static string Span(TimeSpan span) => DisplayFormat.SignedDuration(span);

    /// <summary>The phase's name on every screen ("LVP in force").</summary>
    public static string Phase(OpsLvp.Core.Engine.Phase p) => LvpVocabulary.For(p).Name;
}
