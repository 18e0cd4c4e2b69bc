namespace OpsLvp.FaultCases;

/// <summary>
/// One generated push request: its case name, body bytes, content type (null: none), whether it carries the push key,
/// and what a correct answer is. <paramref name="ExpectedItems"/> is set when a 202 is the correct answer: one entry per
/// item in request order, true when the item must be accepted, false when it must be rejected with a reason.
/// <paramref name="RefusedWith"/> is set when the correct answer is a 4xx: the statuses that are correct. When both are set
/// either answer is correct. <paramref name="Chunked"/> sends the body without a length (chunked transfer).
/// </summary>
public sealed record HostileBody(
    string Case,
    byte[] Body,
    string? ContentType,
    bool WithKey,
    IReadOnlyList<bool>? ExpectedItems,
    IReadOnlyList<int>? RefusedWith,
    bool Chunked = false)
{
    /// <summary>A few bytes of the body for a report line, control bytes and non-ASCII shown as \xNN.</summary>
    public string Preview(int max = 80)
    {
        var text = new System.Text.StringBuilder();
        foreach (var b in Body.AsSpan(0, Math.Min(max, Body.Length)))
        {
            text.Append(b is >= 0x20 and < 0x7F ? ((char)b).ToString() : $"\\x{b:X2}");
        }
        return Body.Length > max ? text + $"… ({Body.Length} bytes)" : text.ToString();
    }
}
