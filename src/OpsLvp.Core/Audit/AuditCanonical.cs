using System.Buffers;
using System.Globalization;
using System.Text;
using System.Text.Json;

namespace OpsLvp.Core.Audit;

/// <summary>
/// The exact bytes an audit entry's hash covers (docs/engine.md R12; docs/audit.md, "Canonical entry").
/// <para>
/// Canonical entry = N("opslvp.audit.v1") ‖ N(sequence) ‖ N(time) ‖ N(actor) ‖ N(kind) ‖ N(canonical payload),
/// where N(s) is a netstring: the decimal count of the UTF-8 bytes of s, ":", those bytes, ",".
/// Sequence is decimal ASCII without sign or leading zeros. Time is the UTC instant as
/// <c>yyyy-MM-ddTHH:mm:ss.fffffffZ</c> (always seven fraction digits, so the full 100 ns tick counts).
/// Strings are UTF-8 without a byte-order mark; a string that is not valid UTF-16 (lone surrogate) is refused.
/// </para>
/// <para>
/// Canonical payload: the JSON value re-written with no whitespace; object members sorted by the UTF-8 bytes of
/// their names (unsigned, shorter first on a common prefix), a repeated name is refused; array order kept;
/// strings in double quotes with only <c>"</c> → <c>\"</c>, <c>\</c> → <c>\\</c>, U+0008 → <c>\b</c>,
/// U+0009 → <c>\t</c>, U+000A → <c>\n</c>, U+000C → <c>\f</c>, U+000D → <c>\r</c>, other U+0000–U+001F →
/// <c>\u00xx</c> (lowercase hex) escaped and everything else written as itself; <c>true</c>, <c>false</c>,
/// <c>null</c> as is; numbers by exact decimal value (no floating point): zero → <c>0</c>; otherwise the value
/// is ±D×10^E with D the significant digits (no leading or trailing zeros), written as an optional <c>-</c>,
/// then D followed by E zeros when E ≥ 0 and D has at most 21 − E digits (<c>550</c>, <c>1000</c>), else D,
/// <c>e</c> and E in decimal (<c>15e-1</c> for 1.5, <c>25e-2</c> for 0.25, <c>1e21</c>).
/// So <c>{"b":1.50, "a":[1E3]}</c> and <c>{"a":[1000],"b":1.5}</c> have the same canonical payload.
/// </para>
/// Hash = lowercase hex of SHA-256(ASCII of the previous hash's 64 lowercase hex digits ‖ canonical entry);
/// the first entry's previous hash is <see cref="AuditChain.GenesisHash"/>.
/// </summary>
public static class AuditCanonical
{
    /// <summary>Format tag that opens every canonical entry; a new format gets a new tag.</summary>
    public const string FormatTag = "opslvp.audit.v1";

    /// <summary>The time format of the canonical entry, applied to the UTC instant.</summary>
    public const string TimeFormat = "yyyy-MM-dd'T'HH:mm:ss.fffffff'Z'";

    private static readonly UTF8Encoding _strictUtf8 = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    /// <summary>The characters a canonical string escapes: the quote, the backslash and U+0000–U+001F.</summary>
    private static readonly SearchValues<char> _escaped = SearchValues.Create(
        "\"\\\u0000\u0001\u0002\u0003\u0004\u0005\u0006\u0007\b\t\n\u000b\f\r\u000e\u000f"
        + "\u0010\u0011\u0012\u0013\u0014\u0015\u0016\u0017\u0018\u0019\u001a\u001b\u001c\u001d\u001e\u001f");

    /// <summary>The canonical entry bytes (without the previous hash).</summary>
    /// <exception cref="ArgumentException">Sequence below 1, empty actor or kind, payload not JSON, or a string not valid UTF-16.</exception>
    public static byte[] EntryBytes(long sequence, DateTimeOffset time, string actor, string kind, string payloadJson)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(sequence, 1);
        var fields = FieldsAfterSequence(time, actor, kind, payloadJson);
        return [.. EntryPrefix(sequence), .. fields];
    }

    /// <summary>The start of the canonical entry: N(format tag) ‖ N(sequence).</summary>
    internal static byte[] EntryPrefix(long sequence)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(sequence, 1);
        using var buffer = new MemoryStream(48);
        WriteNetstring(buffer, FormatTag);
        WriteNetstring(buffer, sequence.ToString(CultureInfo.InvariantCulture));
        return buffer.ToArray();
    }

    /// <summary>The rest of the canonical entry: N(time) ‖ N(actor) ‖ N(kind) ‖ N(canonical payload).</summary>
    /// <exception cref="ArgumentException">Empty actor or kind, payload not JSON, or a string not valid UTF-16.</exception>
    internal static byte[] FieldsAfterSequence(DateTimeOffset time, string actor, string kind, string payloadJson)
    {
        if (string.IsNullOrWhiteSpace(actor))
        {
            throw new ArgumentException("audit actor is empty", nameof(actor));
        }
        if (string.IsNullOrWhiteSpace(kind))
        {
            throw new ArgumentException("audit kind is empty", nameof(kind));
        }
        var payload = CanonicalPayload(payloadJson);
        using var buffer = new MemoryStream(payload.Length + actor.Length + kind.Length + 64);
        WriteNetstring(buffer, FormatTime(time));
        WriteNetstring(buffer, actor);
        WriteNetstring(buffer, kind);
        WriteNetstring(buffer, payload);
        return buffer.ToArray();
    }

    /// <summary>The UTC instant as written in the canonical entry (and in the database).</summary>
    public static string FormatTime(DateTimeOffset time) => time.UtcDateTime.ToString(TimeFormat, CultureInfo.InvariantCulture);

    /// <summary>The canonical form of a JSON value (rules in the type's summary).</summary>
    /// <exception cref="ArgumentException">Not a single JSON value (comments and trailing commas are refused), a repeated member name, or an invalid string.</exception>
    public static string CanonicalPayload(string payloadJson)
    {
        ArgumentNullException.ThrowIfNull(payloadJson);
        try
        {
            using var document = JsonDocument.Parse(payloadJson);
            var builder = new StringBuilder(payloadJson.Length);
            WriteValue(builder, document.RootElement);
            return builder.ToString();
        }
        catch (JsonException ex)
        {
            throw new ArgumentException($"audit payload is not JSON: {ex.Message}", nameof(payloadJson), ex);
        }
        catch (InvalidOperationException ex)
        {
            throw new ArgumentException($"audit payload has an invalid string: {ex.Message}", nameof(payloadJson), ex);
        }
    }

    /// <summary>The canonical form of a JSON number lexeme (exact; no floating point).</summary>
    /// <exception cref="ArgumentException">Not a JSON number, or an exponent beyond ±10^15.</exception>
    public static string CanonicalNumber(string lexeme)
    {
        ArgumentNullException.ThrowIfNull(lexeme);
        var negative = lexeme.StartsWith('-');
        var body = negative ? lexeme[1..] : lexeme;
        var ePos = body.IndexOfAny(['e', 'E']);
        var mantissa = ePos < 0 ? body : body[..ePos];
        long exponent = 0;
        if (ePos >= 0 && !long.TryParse(body[(ePos + 1)..], NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out exponent))
        {
            throw new ArgumentException($"number '{lexeme}' has an unreadable exponent", nameof(lexeme));
        }
        if (Math.Abs(exponent) > 1_000_000_000_000_000L)
        {
            throw new ArgumentException($"number '{lexeme}' has an exponent beyond ±10^15", nameof(lexeme));
        }
        var dot = mantissa.IndexOf('.');
        var digits = dot < 0 ? mantissa : string.Concat(mantissa.AsSpan(0, dot), mantissa.AsSpan(dot + 1));
        if (digits.Length == 0 || !digits.All(char.IsAsciiDigit))
        {
            throw new ArgumentException($"'{lexeme}' is not a JSON number", nameof(lexeme));
        }
        exponent -= dot < 0 ? 0 : mantissa.Length - dot - 1;
        var significant = digits.TrimStart('0');
        if (significant.Length == 0)
        {
            return "0";
        }
        var trimmed = significant.TrimEnd('0');
        exponent += significant.Length - trimmed.Length;
        var sign = negative ? "-" : "";
        return exponent >= 0 && trimmed.Length + exponent <= 21
            ? sign + trimmed + new string('0', (int)exponent)
            : sign + trimmed + "e" + exponent.ToString(CultureInfo.InvariantCulture);
    }

    private static void WriteValue(StringBuilder builder, JsonElement element)
    {
        switch (element.ValueKind)
        {
            case JsonValueKind.Object:
                var members = new List<(string Name, byte[]? Key, JsonElement Value)>();
                var ascii = true;
                foreach (var p in element.EnumerateObject())
                {
                    var name = p.Name;
                    ascii &= Ascii.IsValid(name);
                    members.Add((name, null, p.Value));
                }
                if (ascii)
                {
                    // For ASCII names the UTF-16 ordinal order is the UTF-8 byte order.
                    members.Sort(static (a, b) => string.CompareOrdinal(a.Name, b.Name));
                }
                else
                {
                    for (var i = 0; i < members.Count; i++)
                    {
                        members[i] = members[i] with { Key = _strictUtf8.GetBytes(members[i].Name) };
                    }
                    members.Sort(static (a, b) => a.Key.AsSpan().SequenceCompareTo(b.Key));
                }
                builder.Append('{');
                for (var i = 0; i < members.Count; i++)
                {
                    if (i > 0)
                    {
                        if (string.Equals(members[i].Name, members[i - 1].Name, StringComparison.Ordinal))
                        {
                            throw new ArgumentException($"audit payload repeats the member name '{members[i].Name}'");
                        }
                        builder.Append(',');
                    }
                    WriteString(builder, members[i].Name);
                    builder.Append(':');
                    WriteValue(builder, members[i].Value);
                }
                builder.Append('}');
                break;
            case JsonValueKind.Array:
                builder.Append('[');
                var first = true;
                foreach (var item in element.EnumerateArray())
                {
                    if (!first)
                    {
                        builder.Append(',');
                    }
                    first = false;
                    WriteValue(builder, item);
                }
                builder.Append(']');
                break;
            case JsonValueKind.String:
                WriteString(builder, element.GetString()!);
                break;
            case JsonValueKind.Number:
                // A plain integer lexeme (no fraction, no exponent, at most 19 digits) is already canonical but
                // for "-0"; reading it as a long gives both. Anything else takes the exact decimal route.
                if (element.TryGetInt64(out var integer))
                {
                    builder.Append(integer.ToString(CultureInfo.InvariantCulture));
                }
                else
                {
                    builder.Append(CanonicalNumber(element.GetRawText()));
                }
                break;
            case JsonValueKind.True:
                builder.Append("true");
                break;
            case JsonValueKind.False:
                builder.Append("false");
                break;
            case JsonValueKind.Null:
                builder.Append("null");
                break;
            default:
                throw new ArgumentException($"audit payload has an unexpected JSON element {element.ValueKind}");
        }
    }

    private static void WriteString(StringBuilder builder, string value)
    {
        // Refuses lone surrogates, which UTF-8 cannot carry unambiguously.
        _ = _strictUtf8.GetByteCount(value);
        builder.Append('"');
        var rest = value.AsSpan();
        while (true)
        {
            var next = rest.IndexOfAny(_escaped);
            if (next < 0)
            {
                builder.Append(rest);
                break;
            }
            builder.Append(rest[..next]);
            var c = rest[next];
            switch (c)
            {
                case '"': builder.Append("\\\""); break;
                case '\\': builder.Append("\\\\"); break;
                case '\b': builder.Append("\\b"); break;
                case '\t': builder.Append("\\t"); break;
                case '\n': builder.Append("\\n"); break;
                case '\f': builder.Append("\\f"); break;
                case '\r': builder.Append("\\r"); break;
                default: builder.Append("\\u00").Append(((int)c).ToString("x2", CultureInfo.InvariantCulture)); break;
            }
            rest = rest[(next + 1)..];
        }
        builder.Append('"');
    }

    private static void WriteNetstring(MemoryStream buffer, string value)
    {
        byte[] bytes;
        try
        {
            bytes = _strictUtf8.GetBytes(value);
        }
        catch (EncoderFallbackException ex)
        {
            throw new ArgumentException("audit field is not valid UTF-16 (lone surrogate)", ex);
        }
        Span<byte> length = stackalloc byte[12];
        _ = bytes.Length.TryFormat(length, out var written, default, CultureInfo.InvariantCulture);
        length[written++] = (byte)':';
        buffer.Write(length[..written]);
        buffer.Write(bytes);
        buffer.WriteByte((byte)',');
    }
}
