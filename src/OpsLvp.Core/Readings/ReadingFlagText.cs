namespace OpsLvp.Core.Readings;

/// <summary>How screens and events word <see cref="ReadingFlags"/> (docs/engine.md R19–R22): one wording everywhere.</summary>
public static class ReadingFlagText
{
    /// <summary>The flags as short words joined by ", " (e.g. "luminance unknown"); empty for none.</summary>
    public static string Describe(ReadingFlags flags) => string.Join(", ", Words(flags));

    /// <summary>The flags as short words, in a fixed order.</summary>
    public static IReadOnlyList<string> Words(ReadingFlags flags)
    {
        var words = new List<string>(3);
        if (flags.HasFlag(ReadingFlags.OrMore))
        {
            words.Add("or more");
        }
        if (flags.HasFlag(ReadingFlags.LuminanceUnknown))
        {
            words.Add("luminance unknown");
        }
        if (flags.HasFlag(ReadingFlags.LightStepUnknown))
        {
            words.Add("light step unknown");
        }
        return words;
    }

    /// <summary>The prefix a value takes: "≥ " for a lower bound (<see cref="ReadingFlags.OrMore"/>), else empty.</summary>
    public static string ValuePrefix(ReadingFlags flags) => flags.HasFlag(ReadingFlags.OrMore) ? "≥ " : "";
}
