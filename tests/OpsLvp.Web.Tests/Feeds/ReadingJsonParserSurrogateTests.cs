using System.Text;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>
/// An escaped lone surrogate (<c>"\ud800"</c>) is valid JSON but not Unicode text: System.Text.Json throws when it is read
/// as a string. The fault suite's lone-surrogate bodies got 500 from push ingest (docs/reliability.md "Fault runs");
/// now the item is rejected with a reason, or the document refused when the surrogate is in one of its own names.
/// Sensor ids and values are invented.
/// </summary>
public sealed class ReadingJsonParserSurrogateTests
{
    private const string Good = """{ "time": "2026-01-15T03:00:00Z", "sensor": "S1", "kind": "rvr", "value": 550, "status": "ok" }""";

    [Theory]
    [InlineData("""{ "time": "2026-01-15T03:00:00Z", "sensor": "S\ud800", "kind": "rvr", "value": 550, "status": "ok" }""")]
    [InlineData("""{ "time": "2026-01-15T03:00:00Z\udfff", "sensor": "S1", "kind": "rvr", "value": 550, "status": "ok" }""")]
    [InlineData("""{ "time": "2026-01-15T03:00:00Z", "sensor": "S1", "kind": "rvr", "value": 550, "status": "ok", "n\ud83d": 1 }""")]
    public void LoneSurrogateInAnItem_RejectsThatItem_WithAReason_AndKeepsTheOthers(string bad)
    {
        var result = ReadingJsonParser.Parse(Encoding.UTF8.GetBytes($$"""{ "readings": [ {{Good}}, {{bad}} ] }"""));

        Assert.Single(result.Readings);
        var rejection = Assert.Single(result.Rejections);
        Assert.Equal(1, rejection.Index);
        Assert.Equal(RejectReason.Malformed, rejection.Reason);
        Assert.Contains("unpaired surrogate", rejection.Detail, StringComparison.Ordinal);
    }

    [Fact]
    public void LoneSurrogateInADocumentName_RefusesTheDocument_WithAReason()
    {
        var ex = Assert.Throws<FeedFormatException>(() => ReadingJsonParser.Parse(Encoding.UTF8.GetBytes($$"""{ "\udc00": 1, "readings": [ {{Good}} ] }""")));

        Assert.Contains("unpaired surrogate", ex.Message, StringComparison.Ordinal);
    }
}
