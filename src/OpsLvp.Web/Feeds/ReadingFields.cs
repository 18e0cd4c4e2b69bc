using System.Globalization;
using System.Text.RegularExpressions;
using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// Structural checks of one reading's fields, shared by the JSON and CSV formats. Each method returns
/// null on success or a one-line detail naming the field and what is wrong.
/// </summary>
public static partial class ReadingFields
{
    /// <summary>Longest accepted sensor id, characters.</summary>
    public const int MaxSensorIdLength = 32;

    [GeneratedRegex(@"^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,7})?)?(Z|[+-]\d{2}:\d{2})\z", RegexOptions.CultureInvariant)]
    private static partial Regex IsoWithOffset();

    [GeneratedRegex(@"^[A-Za-z0-9][A-Za-z0-9_.\-]*\z", RegexOptions.CultureInvariant)]
    private static partial Regex SensorIdPattern();

    /// <summary>ISO-8601 date and time with an explicit offset (<c>Z</c> or <c>±hh:mm</c>); the result is in UTC.</summary>
    public static string? Time(string? text, out DateTimeOffset time)
    {
        time = default;
        if (string.IsNullOrEmpty(text))
        {
            return "time is missing";
        }

        if (ControlCharacter("time", text) is { } control)
        {
            return control;
        }

        if (!IsoWithOffset().IsMatch(text)
            || !DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.None, out time))
        {
            return $"time '{Clip(text)}' is not ISO-8601 with an offset, e.g. 2026-01-15T03:00:00Z";
        }

        time = time.ToUniversalTime();
        return null;
    }

    public static string? Sensor(string? text)
    {
        if (string.IsNullOrEmpty(text))
        {
            return "sensor is missing";
        }

        if (ControlCharacter("sensor", text) is { } control)
        {
            return control;
        }

        if (text.Length > MaxSensorIdLength || !SensorIdPattern().IsMatch(text))
        {
            return $"sensor '{Clip(text)}' must be 1-{MaxSensorIdLength} letters, digits, '_', '.' or '-'";
        }

        return null;
    }

    public static string? Kind(string? text, out ReadingKind kind)
    {
        kind = default;
        if (string.IsNullOrEmpty(text))
        {
            return "kind is missing";
        }

        return ReadingWireNames.TryParseKind(text, out kind)
            ? null
            : $"kind '{Clip(text)}' is not one of {string.Join(", ", ReadingWireNames.Kinds)}";
    }

    public static string? Status(string? text, out ReadingStatus status)
    {
        status = default;
        if (string.IsNullOrEmpty(text))
        {
            return "status is missing";
        }

        return ReadingWireNames.TryParseStatus(text, out status)
            ? null
            : $"status '{Clip(text)}' is not one of {string.Join(", ", ReadingWireNames.Statuses)}";
    }

    public static string? Value(double value) =>
        double.IsFinite(value) ? null : "value must be a finite number";

    /// <summary>Invariant-culture decimal number (CSV); rejects NaN, infinities and thousands separators.</summary>
    public static string? Value(string? text, out double value)
    {
        value = 0;
        if (string.IsNullOrEmpty(text))
        {
            return "value is missing";
        }

        if (!double.TryParse(text, NumberStyles.AllowLeadingSign | NumberStyles.AllowDecimalPoint | NumberStyles.AllowExponent,
                CultureInfo.InvariantCulture, out value) || !double.IsFinite(value))
        {
            return $"value '{Clip(text)}' is not a finite number";
        }

        return null;
    }

    /// <summary>
    /// Shortens echoed input so a hostile item cannot flood logs or responses, and shows control characters as
    /// <c>\uXXXX</c> so none reaches a log line or a screen.
    /// </summary>
    public static string Clip(string text)
    {
        var clipped = text.Length <= 40 ? text : string.Concat(text.AsSpan(0, 40), "…");
        if (!clipped.Any(char.IsControl))
        {
            return clipped;
        }

        var escaped = new System.Text.StringBuilder(clipped.Length + 8);
        foreach (var c in clipped)
        {
            escaped.Append(char.IsControl(c) ? string.Create(CultureInfo.InvariantCulture, $"\\u{(int)c:X4}") : c.ToString());
        }

        return escaped.ToString();
    }

    /// <summary>A detail naming <paramref name="field"/> and the first control character in it, or null when there is none.</summary>
    private static string? ControlCharacter(string field, string text)
    {
        var at = text.AsSpan().IndexOfAnyInRange('\u0000', '\u001F');
        if (at < 0)
        {
            at = text.AsSpan().IndexOfAnyInRange('\u007F', '\u009F');
        }

        return at < 0
            ? null
            : string.Create(CultureInfo.InvariantCulture, $"{field} contains a control character (U+{(int)text[at]:X4} at position {at}); '{Clip(text)}'");
    }
}
