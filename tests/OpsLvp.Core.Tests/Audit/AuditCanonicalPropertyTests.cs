using System.Globalization;
using System.Text;
using System.Text.Json;
using CsCheck;
using OpsLvp.Core.Audit;

namespace OpsLvp.Core.Tests.Audit;

/// <summary>Properties of the canonical payload (docs/audit.md): formatting never changes it, content always does.</summary>
public class AuditCanonicalPropertyTests
{
    [Fact]
    public void Payload_WrittenTwoDifferentWays_HasOneCanonicalForm()
    {
        Gen.Int.Sample(seed =>
        {
            var tree = RandomTree(new Random(seed), depth: 0);
            var compact = new StringBuilder();
            var spaced = new StringBuilder();
            Write(compact, tree, spaced: false, new Random(seed ^ 1));
            Write(spaced, tree, spaced: true, new Random(seed ^ 2));

            Assert.Equal(AuditCanonical.CanonicalPayload(compact.ToString()), AuditCanonical.CanonicalPayload(spaced.ToString()));
        });
    }

    [Fact]
    public void CanonicalPayload_IsJson_AndCanonicalisesToItself()
    {
        Gen.Int.Sample(seed =>
        {
            var text = new StringBuilder();
            Write(text, RandomTree(new Random(seed), depth: 0), spaced: true, new Random(seed));
            var canonical = AuditCanonical.CanonicalPayload(text.ToString());

            using var _ = JsonDocument.Parse(canonical);
            Assert.Equal(canonical, AuditCanonical.CanonicalPayload(canonical));
        });
    }

    [Fact]
    public void IntegerInAPayload_TakesTheShortRoute_WithTheSameFormAsTheExactDecimalRoute()
    {
        Gen.Long.Sample(n =>
        {
            var lexeme = n.ToString(CultureInfo.InvariantCulture);
            Assert.Equal("[" + AuditCanonical.CanonicalNumber(lexeme) + "]", AuditCanonical.CanonicalPayload("[" + lexeme + "]"));
        });
        // Edges: negative zero, the long range's ends and one past them (exact route), trailing zeros.
        foreach (var lexeme in new[] { "-0", "0", "9223372036854775807", "-9223372036854775808", "9223372036854775808", "-9223372036854775809", "1000", "-1000" })
        {
            Assert.Equal("[" + AuditCanonical.CanonicalNumber(lexeme) + "]", AuditCanonical.CanonicalPayload("[" + lexeme + "]"));
        }
    }

    [Fact]
    public void PreparedEntry_ChainsToTheHashOfTheDocumentedBytes()
    {
        Gen.Select(Gen.Int, Gen.Long[1, long.MaxValue - 1], Gen.String[Gen.Char.AlphaNumeric, 1, 12]).Sample((seed, sequence, actor) =>
        {
            var text = new StringBuilder();
            Write(text, RandomTree(new Random(seed), depth: 0), spaced: true, new Random(seed));
            var payload = text.ToString();
            var time = DateTimeOffset.UnixEpoch.AddTicks((seed & 0x7fffffff) * 1_000_003L);
            var previousHash = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(BitConverter.GetBytes(seed)));

            var chained = AuditChain.Append(new AuditChainHead(sequence, previousHash), AuditChain.Prepare(time, actor, "tick", payload));

            Assert.Equal(sequence + 1, chained.Sequence);
            Assert.Equal(previousHash, chained.PreviousHash);
            Assert.Equal(AuditChain.ComputeHash(previousHash, AuditCanonical.EntryBytes(sequence + 1, time, actor, "tick", payload)), chained.Hash);
            Assert.Equal(chained.Hash, AuditChain.ComputeHash(chained));
        });
    }

    [Fact]
    public void Number_EveryWritingOfOneValue_HasOneFormWithThatValue()
    {
        Gen.Select(Gen.Long[1, 999_999_999_999L], Gen.Int[-30, 30], Gen.Int[0, 5], Gen.Bool).Sample((digits, exponent, shift, negative) =>
        {
            var sign = negative ? "-" : "";
            var forms = new[]
            {
                Number(digits, exponent, 0, sign, plain: false),
                Number(digits, exponent, shift, sign, plain: false),
                Number(digits, exponent, shift, sign, plain: true),
            };
            var canonical = forms.Select(AuditCanonical.CanonicalNumber).Distinct().ToList();

            Assert.Single(canonical);
            Assert.Equal(double.Parse(forms[0], CultureInfo.InvariantCulture), double.Parse(canonical[0], CultureInfo.InvariantCulture));
        });
    }

    [Fact]
    public void Payload_OneValueChanged_ChangesTheCanonicalForm()
    {
        Gen.Select(Gen.Int, Gen.Int[0, 1000]).Sample((seed, bump) =>
        {
            var a = AuditCanonical.CanonicalPayload($"{{\"rvr_m\":{seed},\"n\":[{bump}]}}");
            var b = AuditCanonical.CanonicalPayload($"{{\"rvr_m\":{seed},\"n\":[{bump + 1}]}}");

            Assert.NotEqual(a, b);
        });
    }

    // D×10^E written as digits with `shift` extra trailing zeros compensated in the exponent, either with an
    // exponent ("12300e-5") or as a plain decimal ("0.123").
    private static string Number(long digits, int exponent, int shift, string sign, bool plain)
    {
        var d = digits.ToString(CultureInfo.InvariantCulture) + new string('0', shift);
        var e = exponent - shift;
        if (!plain)
        {
            return sign + d + "e" + e.ToString(CultureInfo.InvariantCulture);
        }
        if (e >= 0)
        {
            return sign + d + new string('0', e);
        }
        var point = d.Length + e;
        return point > 0
            ? sign + d[..point] + "." + d[point..]
            : sign + "0." + new string('0', -point) + d;
    }

    private abstract record Node;

    private sealed record ObjectNode(IReadOnlyList<(string Key, Node Value)> Members) : Node;

    private sealed record ArrayNode(IReadOnlyList<Node> Items) : Node;

    private sealed record StringNode(string Value) : Node;

    private sealed record NumberNode(long Digits, int Exponent) : Node;

    private sealed record LiteralNode(string Text) : Node;

    private static readonly string[] _keys = ["a", "b", "Z", "rvr_m", "é", "\uFF5E", "\U0001F600", "a b", "\"q\"", "ab"];

    private static Node RandomTree(Random random, int depth)
    {
        var pick = depth >= 3 ? random.Next(3, 7) : random.Next(7);
        switch (pick)
        {
            case 0:
            case 1:
                var keys = _keys.OrderBy(_ => random.Next()).Take(random.Next(0, 5)).ToList();
                return new ObjectNode(keys.Select(k => (k, RandomTree(random, depth + 1))).ToList());
            case 2:
                return new ArrayNode(Enumerable.Range(0, random.Next(0, 4)).Select(_ => RandomTree(random, depth + 1)).ToList());
            case 3:
                const string alphabet = "ab\"\\/\n\t\u0001é€";
                var chars = Enumerable.Range(0, random.Next(0, 6)).Select(_ => alphabet[random.Next(alphabet.Length)]);
                return new StringNode(string.Concat(chars));
            case 4:
                return new NumberNode(random.Next(0, 100000) * (random.Next(2) == 0 ? 1 : -1), random.Next(-6, 6));
            default:
                return new LiteralNode(new[] { "true", "false", "null" }[random.Next(3)]);
        }
    }

    private static void Write(StringBuilder text, Node node, bool spaced, Random random)
    {
        var gap = spaced ? " \n\t " : "";
        switch (node)
        {
            case ObjectNode o:
                var members = spaced ? o.Members.Reverse().ToList() : o.Members.ToList();
                text.Append('{').Append(gap);
                for (var i = 0; i < members.Count; i++)
                {
                    text.Append(i > 0 ? "," + gap : "");
                    WriteString(text, members[i].Key, escapeAll: spaced);
                    text.Append(gap).Append(':').Append(gap);
                    Write(text, members[i].Value, spaced, random);
                }
                text.Append(gap).Append('}');
                break;
            case ArrayNode a:
                text.Append('[').Append(gap);
                for (var i = 0; i < a.Items.Count; i++)
                {
                    text.Append(i > 0 ? "," + gap : "");
                    Write(text, a.Items[i], spaced, random);
                }
                text.Append(gap).Append(']');
                break;
            case StringNode s:
                WriteString(text, s.Value, escapeAll: spaced);
                break;
            case NumberNode n:
                var sign = n.Digits < 0 ? "-" : "";
                var digits = Math.Abs(n.Digits);
                text.Append(digits == 0
                    ? (spaced ? "-0.0e3" : "0")
                    : Number(digits, n.Exponent, spaced ? random.Next(0, 3) : 0, sign, plain: spaced));
                break;
            case LiteralNode l:
                text.Append(l.Text);
                break;
        }
    }

    // escapeAll writes every character as \uXXXX, the most different legal spelling.
    private static void WriteString(StringBuilder text, string value, bool escapeAll)
    {
        if (escapeAll)
        {
            text.Append('"');
            foreach (var c in value)
            {
                text.Append("\\u").Append(((int)c).ToString("X4", CultureInfo.InvariantCulture));
            }
            text.Append('"');
        }
        else
        {
            text.Append(JsonSerializer.Serialize(value));
        }
    }
}
