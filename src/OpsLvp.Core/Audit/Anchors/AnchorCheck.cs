using System.Globalization;

namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// Compares a chain with its anchor log (docs/audit.md "Verification with anchors"). Every line is read and its
/// signature checked (against <c>trustedFingerprint</c> when given, else against the line's own key, and all lines
/// must then name one key); anchors from the last <see cref="AuditAnchor.Reset"/> line on are compared with the chain:
/// an anchor past the chain's head is <c>truncated</c>, an anchored entry with another hash is <c>rewritten</c>.
/// </summary>
public static class AnchorCheck
{
    /// <summary>The anchors that passed their signature check, with their 1-based line numbers, and the problems of the others.</summary>
    public static (IReadOnlyList<(int Line, AuditAnchor Anchor)> Valid, IReadOnlyList<AuditAnomaly> Problems) Read(IEnumerable<string> lines, string? trustedFingerprint)
    {
        ArgumentNullException.ThrowIfNull(lines);
        var valid = new List<(int, AuditAnchor)>();
        var problems = new List<AuditAnomaly>();
        string? firstKey = null;
        var number = 0;
        foreach (var line in lines)
        {
            number++;
            if (string.IsNullOrWhiteSpace(line))
            {
                continue;
            }
            AuditAnchor anchor;
            try
            {
                anchor = AuditAnchor.Parse(line);
            }
            catch (FormatException ex)
            {
                problems.Add(new AuditAnomaly("anchor_malformed", null, number, $"anchor line {number}: {ex.Message}"));
                continue;
            }
            if (!anchor.SignatureValid())
            {
                problems.Add(new AuditAnomaly("anchor_signature_invalid", anchor.Sequence, number,
                    Text($"anchor line {number} (sequence {anchor.Sequence}, {AuditCanonical.FormatTime(anchor.Time)}): the signature does not verify")));
                continue;
            }
            var expected = trustedFingerprint ?? (firstKey ??= anchor.KeyFingerprint);
            if (!string.Equals(anchor.KeyFingerprint, expected, StringComparison.Ordinal))
            {
                problems.Add(new AuditAnomaly("anchor_wrong_key", anchor.Sequence, number,
                    Text($"anchor line {number} (sequence {anchor.Sequence}) is signed by key {anchor.KeyFingerprint[..16]}…, not by {expected[..Math.Min(16, expected.Length)]}…")));
                continue;
            }
            valid.Add((number, anchor));
        }
        return (valid, problems);
    }

    /// <summary>
    /// The anchors in force (from the last reset on) compared with the chain: <paramref name="head"/> is the last
    /// stored sequence (0 when empty), <paramref name="hashAt"/> the stored hash at a sequence (null when absent).
    /// </summary>
    public static IReadOnlyList<AuditAnomaly> Compare(IReadOnlyList<(int Line, AuditAnchor Anchor)> valid, long head, Func<long, string?> hashAt)
    {
        ArgumentNullException.ThrowIfNull(valid);
        ArgumentNullException.ThrowIfNull(hashAt);
        var problems = new List<AuditAnomaly>();
        var from = 0;
        for (var i = 0; i < valid.Count; i++)
        {
            if (valid[i].Anchor.Reset)
            {
                from = i;
            }
        }
        (int Line, AuditAnchor Anchor)? newest = null;
        for (var i = from; i < valid.Count; i++)
        {
            var (line, anchor) = valid[i];
            if (newest is null || anchor.Sequence > newest.Value.Anchor.Sequence)
            {
                newest = (line, anchor);
            }
            if (anchor.Sequence == 0 || anchor.Sequence > head)
            {
                continue;
            }
            var stored = hashAt(anchor.Sequence);
            if (!string.Equals(stored, anchor.Hash, StringComparison.Ordinal))
            {
                problems.Add(new AuditAnomaly("rewritten", anchor.Sequence, line,
                    Text($"entry {anchor.Sequence} differs from anchor line {line} signed {AuditCanonical.FormatTime(anchor.Time)}: the chain was rewritten at or before {anchor.Sequence}")));
            }
        }
        if (newest is { } n && n.Anchor.Sequence > head)
        {
            problems.Insert(0, new AuditAnomaly("truncated", n.Anchor.Sequence, n.Line,
                Text($"the chain ends at {head} but anchor line {n.Line} signed {AuditCanonical.FormatTime(n.Anchor.Time)} covers sequence {n.Anchor.Sequence}: entries {head + 1}–{n.Anchor.Sequence} were removed")));
        }
        return problems;
    }

    private static string Text(FormattableString s) => s.ToString(CultureInfo.InvariantCulture);
}
