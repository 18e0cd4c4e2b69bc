using System.Globalization;
using System.Text;

namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// Netstring concatenation for the signed and digested forms of docs/audit.md ("Anchors", "State seal", "Readings
/// covered"): N(s) = decimal count of the UTF-8 bytes of s, ":", those bytes, ","; an absent value is the single
/// byte <c>~</c> (a netstring always starts with a digit, so the two cannot be confused).
/// </summary>
public sealed class Netstrings
{
    private static readonly UTF8Encoding s_utf8 = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    private readonly MemoryStream _bytes = new();

    /// <summary>Appends N(<paramref name="value"/>), or <c>~</c> when it is null.</summary>
    public Netstrings Add(string? value)
    {
        if (value is null)
        {
            _bytes.WriteByte((byte)'~');
            return this;
        }
        var data = s_utf8.GetBytes(value);
        var prefix = Encoding.ASCII.GetBytes(data.Length.ToString(CultureInfo.InvariantCulture) + ":");
        _bytes.Write(prefix);
        _bytes.Write(data);
        _bytes.WriteByte((byte)',');
        return this;
    }

    public Netstrings Add(long value) => Add(value.ToString(CultureInfo.InvariantCulture));

    public byte[] ToArray() => _bytes.ToArray();
}
