using System.Globalization;
using Microsoft.EntityFrameworkCore.Storage.ValueConversion;
using OpsLvp.Core.Audit;

namespace OpsLvp.Data;

/// <summary>
/// Stores a <see cref="DateTimeOffset"/> as fixed-width UTC text <c>yyyy-MM-ddTHH:mm:ss.fffffffZ</c>: exact to the
/// tick, readable in raw SQL, and ordered correctly as text (SQLite has no date type).
/// </summary>
public sealed class UtcTextConverter() : ValueConverter<DateTimeOffset, string>(v => Format(v), v => Parse(v))
{
    public static string Format(DateTimeOffset value) => AuditCanonical.FormatTime(value);

    /// <exception cref="FormatException">Not in the fixed format.</exception>
    public static DateTimeOffset Parse(string text) =>
        DateTimeOffset.ParseExact(text, AuditCanonical.TimeFormat, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal);

    public static bool TryParse(string? text, out DateTimeOffset value) =>
        DateTimeOffset.TryParseExact(text, AuditCanonical.TimeFormat, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal, out value);
}
