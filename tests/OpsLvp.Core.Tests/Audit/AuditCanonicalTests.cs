using System.Text;
using OpsLvp.Core.Audit;

namespace OpsLvp.Core.Tests.Audit;

public class AuditCanonicalTests
{
    [Theory]
    // Expected forms follow the number rule written in docs/audit.md (our own specification).
    [InlineData("0", "0")]
    [InlineData("-0.000", "0")]
    [InlineData("0e5", "0")]
    [InlineData("550", "550")]
    [InlineData("550.0", "550")]
    [InlineData("5.5e2", "550")]
    [InlineData("1E3", "1000")]
    [InlineData("1.5", "15e-1")]
    [InlineData("1.50", "15e-1")]
    [InlineData("0.25", "25e-2")]
    [InlineData("-12.5", "-125e-1")]
    [InlineData("123456789012345678901", "123456789012345678901")]
    [InlineData("1e20", "100000000000000000000")]
    [InlineData("1e21", "1e21")]
    [InlineData("9007199254740993", "9007199254740993")]
    public void Number_EqualValues_HaveOneForm(string lexeme, string expected)
    {
        Assert.Equal(expected, AuditCanonical.CanonicalNumber(lexeme));
    }

    [Fact]
    public void Payload_FormattingAndKeyOrder_DoNotChangeTheCanonicalForm()
    {
        var a = AuditCanonical.CanonicalPayload("{\"b\":1.50, \"a\":[1E3, true, null]}");
        var b = AuditCanonical.CanonicalPayload("{\n  \"a\" : [ 1000 , true , null ] ,\n  \"b\" : 1.5\n}");

        Assert.Equal("{\"a\":[1000,true,null],\"b\":15e-1}", a);
        Assert.Equal(a, b);
    }

    [Fact]
    public void Payload_DifferentValues_HaveDifferentForms()
    {
        Assert.NotEqual(AuditCanonical.CanonicalPayload("{\"a\":\"1\"}"), AuditCanonical.CanonicalPayload("{\"a\":1}"));
        Assert.NotEqual(AuditCanonical.CanonicalPayload("[1,2]"), AuditCanonical.CanonicalPayload("[2,1]"));
    }

    [Fact]
    public void Payload_Strings_UseTheMinimalEscapes()
    {
        var canonical = AuditCanonical.CanonicalPayload("[\"\\u0041\\/\\\"\\\\\\n\\u0001\\u00e9\"]");

        Assert.Equal("[\"A/\\\"\\\\\\n\\u0001é\"]", canonical);
    }

    [Fact]
    public void Payload_MembersSortByUtf8Bytes_NotByUtf16Units()
    {
        // U+FF5E is EF BD 9E in UTF-8, U+1F600 is F0 9F 98 80: UTF-8 order puts U+FF5E first,
        // UTF-16 order (FF5E vs D83D) would put U+1F600 first.
        var canonical = AuditCanonical.CanonicalPayload("{\"\U0001F600\":1,\"\uFF5E\":2,\"Z\":3,\"a\":4}");

        Assert.Equal("{\"Z\":3,\"a\":4,\"\uFF5E\":2,\"\U0001F600\":1}", canonical);
    }

    [Theory]
    [InlineData("")]
    [InlineData("{\"a\":1,}")]
    [InlineData("{\"a\":1} // note")]
    [InlineData("{\"a\":1,\"a\":2}")]
    [InlineData("[\"\\ud800\"]")]
    [InlineData("{\"a\":1}{")]
    public void Payload_NotOneUnambiguousJsonValue_IsRefused(string payload)
    {
        Assert.Throws<ArgumentException>(() => AuditCanonical.CanonicalPayload(payload));
    }

    [Fact]
    public void EntryBytes_AreTheDocumentedNetstrings()
    {
        var bytes = AuditCanonical.EntryBytes(
            7, new DateTimeOffset(2026, 1, 2, 5, 4, 5, TimeSpan.FromHours(2)), "Zoë", "tick", "{ \"x\" : 1.0 }");

        // Time is written as the UTC instant; "Zoë" is 4 UTF-8 bytes.
        Assert.Equal("15:opslvp.audit.v1,1:7,28:2026-01-02T03:04:05.0000000Z,4:Zoë,4:tick,7:{\"x\":1},", Encoding.UTF8.GetString(bytes));
    }

    [Theory]
    [InlineData(0, "a", "k")]
    [InlineData(1, "", "k")]
    [InlineData(1, "a", " ")]
    public void EntryBytes_BadFields_AreRefused(long sequence, string actor, string kind)
    {
        Assert.ThrowsAny<ArgumentException>(() => AuditCanonical.EntryBytes(sequence, DateTimeOffset.UnixEpoch, actor, kind, "{}"));
    }
}
