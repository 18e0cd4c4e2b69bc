using System.Text;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Tests.Feeds;

/// <summary>The JSON format is OpsLvp's own (docs/feeds.md); sensor ids and values are invented.</summary>
public sealed class ReadingJsonParserTests
{
    private static ReadingParseResult Parse(string json) => ReadingJsonParser.Parse(Encoding.UTF8.GetBytes(json));

    private static string Item(string time = "2026-01-15T03:00:00Z", string sensor = "\"S1\"", string kind = "\"rvr\"", string value = "550", string status = "\"ok\"") =>
        $$"""{ "readings": [ { "time": "{{time}}", "sensor": {{sensor}}, "kind": {{kind}}, "value": {{value}}, "status": {{status}} } ] }""";

    [Theory]
    [InlineData("rvr", ReadingKind.Rvr)]
    [InlineData("visibility", ReadingKind.Visibility)]
    [InlineData("cloud_base", ReadingKind.CloudBase)]
    [InlineData("vertical_visibility", ReadingKind.VerticalVisibility)]
    [InlineData("extinction", ReadingKind.Extinction)]
    [InlineData("transmittance", ReadingKind.Transmittance)]
    [InlineData("background_luminance", ReadingKind.BackgroundLuminance)]
    [InlineData("light_step", ReadingKind.LightStep)]
    public void EveryDocumentedKind_IsRead(string wire, ReadingKind expected)
    {
        var result = Parse(Item(kind: $"\"{wire}\""));

        Assert.Equal(expected, Assert.Single(result.Readings).Kind);
    }

    [Theory]
    [InlineData("ok", ReadingStatus.Ok)]
    [InlineData("degraded", ReadingStatus.Degraded)]
    [InlineData("failed", ReadingStatus.Failed)]
    [InlineData("maintenance", ReadingStatus.Maintenance)]
    public void EveryDocumentedStatus_IsRead(string wire, ReadingStatus expected)
    {
        var result = Parse(Item(status: $"\"{wire}\""));

        Assert.Equal(expected, Assert.Single(result.Readings).Status);
    }

    [Theory]
    // ISO 8601 / RFC 3339 date-time with offset (from memory): Z, +hh:mm, -hh:mm, fractional seconds, no seconds.
    [InlineData("2026-01-15T03:00:00Z", "2026-01-15T03:00:00Z")]
    [InlineData("2026-01-15T04:30:00+01:30", "2026-01-15T03:00:00Z")]
    [InlineData("2026-01-14T22:00:00-05:00", "2026-01-15T03:00:00Z")]
    [InlineData("2026-01-15T03:00:00.250Z", "2026-01-15T03:00:00.25Z")]
    [InlineData("2026-01-15T03:00Z", "2026-01-15T03:00:00Z")]
    public void TimeWithOffset_IsConvertedToUtc(string wire, string expectedUtc)
    {
        var reading = Assert.Single(Parse(Item(time: wire)).Readings);

        Assert.Equal(DateTimeOffset.Parse(expectedUtc, System.Globalization.CultureInfo.InvariantCulture), reading.Time);
        Assert.Equal(TimeSpan.Zero, reading.Time.Offset);
    }

    [Theory]
    [InlineData("2026-01-15T03:00:00", "time '2026-01-15T03:00:00' is not ISO-8601 with an offset")]
    [InlineData("2026-01-15 03:00:00Z", "is not ISO-8601 with an offset")]
    [InlineData("15/01/2026 03:00", "is not ISO-8601 with an offset")]
    [InlineData("2026-02-30T03:00:00Z", "is not ISO-8601 with an offset")]
    public void TimeWithoutOffsetOrInvalid_IsMalformed(string wire, string expectedDetail)
    {
        var result = Parse(Item(time: wire));

        Assert.Empty(result.Readings);
        var rejection = Assert.Single(result.Rejections);
        Assert.Equal(RejectReason.Malformed, rejection.Reason);
        Assert.Contains(expectedDetail, rejection.Detail, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("\"RVR\"", "\"ok\"", "kind 'RVR' is not one of")]
    [InlineData("\"rvr\"", "\"OK\"", "status 'OK' is not one of")]
    [InlineData("\"rvr\"", "null", "status is missing")]
    [InlineData("5", "\"ok\"", "kind must be a string (got a number)")]
    public void UnknownKindOrStatus_IsMalformed_CaseSensitive(string kind, string status, string expectedDetail)
    {
        var rejection = Assert.Single(Parse(Item(kind: kind, status: status)).Rejections);

        Assert.Contains(expectedDetail, rejection.Detail, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("1e999", "value must be a finite number")]
    [InlineData("\"NaN\"", "value must be a number (got a string)")]
    [InlineData("null", "value is missing")]
    [InlineData("true", "value must be a number (got a boolean)")]
    public void NonFiniteOrNonNumericValue_IsMalformed(string value, string expectedDetail)
    {
        var rejection = Assert.Single(Parse(Item(value: value)).Rejections);

        Assert.Equal(expectedDetail, rejection.Detail);
    }

    [Theory]
    [InlineData("\"\"", "sensor is missing")]
    [InlineData("\"RVR 09\"", "sensor 'RVR 09' must be 1-32 letters, digits")]
    [InlineData("\"ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456\"", "must be 1-32 letters")]
    public void BadSensorId_IsMalformed(string sensor, string expectedDetail)
    {
        var rejection = Assert.Single(Parse(Item(sensor: sensor)).Rejections);

        Assert.Contains(expectedDetail, rejection.Detail, StringComparison.Ordinal);
        Assert.Null(rejection.SensorId);
    }

    [Fact]
    public void SeveralProblemsInOneItem_AreAllNamed()
    {
        var rejection = Assert.Single(Parse("""{ "readings": [ { "sensor": "S1", "kind": "fog", "value": "x" } ] }""").Rejections);

        Assert.Equal("time is missing; status is missing; kind 'fog' is not one of rvr, visibility, cloud_base, vertical_visibility, extinction, transmittance, background_luminance, light_step; value must be a number (got a string)", rejection.Detail);
        Assert.Equal("S1", rejection.SensorId);
    }

    [Fact]
    public void UnknownExtraFields_AreIgnored()
    {
        var result = Parse("""{ "feed": "x", "readings": [ { "time": "2026-01-15T03:00:00Z", "sensor": "S1", "kind": "rvr", "value": 550, "status": "ok", "note": "n" } ] }""");

        Assert.Single(result.Readings);
        Assert.Empty(result.Rejections);
    }

    [Fact]
    public void EmptyReadingsArray_IsAnEmptyResult()
    {
        var result = Parse("""{ "readings": [] }""");

        Assert.Empty(result.Readings);
        Assert.Empty(result.Rejections);
    }

    [Theory]
    [InlineData("", "body is not valid JSON")]
    [InlineData("{ \"readings\": [ ", "body is not valid JSON")]
    [InlineData("\"readings\"", "body must be a JSON object with a \"readings\" array (got a string)")]
    [InlineData("{ \"reading\": [] }", "body must have a \"readings\" array")]
    [InlineData("{ \"readings\": {} }", "body must have a \"readings\" array")]
    public void WrongDocument_Throws_WithMessage(string json, string expected)
    {
        var ex = Assert.Throws<FeedFormatException>(() => Parse(json));

        Assert.StartsWith(expected, ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void TooManyItems_Throws()
    {
        var items = string.Join(",", Enumerable.Repeat("{}", ReadingJsonParser.MaxItems + 1));

        var ex = Assert.Throws<FeedItemLimitException>(() => Parse("{ \"readings\": [" + items + "] }"));

        Assert.Equal("\"readings\" has 10001 items; at most 10000 are accepted per document", ex.Message);
    }

    [Fact]
    public void InvalidUtf8_Throws()
    {
        Assert.Throws<FeedFormatException>(() => ReadingJsonParser.Parse(new byte[] { 0xFF, 0xFE, 0x7B, 0x7D }));
    }

    [Fact]
    public void InvalidUtf8InsideAString_ThrowsNamingTheOffset()
    {
        // "S\xC3(" : a two-byte lead followed by an ASCII byte, the sequence that surfaced as a 500 from GetString()
        var bytes = Encoding.UTF8.GetBytes(Item(sensor: "\"S\u00C3\"")).ToList();
        var at = bytes.IndexOf(0xC3);
        bytes[at + 1] = (byte)'(';

        var ex = Assert.Throws<FeedFormatException>(() => ReadingJsonParser.Parse(bytes.ToArray()));

        Assert.Equal($"body is not valid UTF-8 (first bad byte at offset {at})", ex.Message);
    }

    [Fact]
    public void DuplicateFieldInAnItem_RejectsThatItem_InsteadOfTakingTheLastValue()
    {
        var result = Parse("""
            { "readings": [
              { "time": "2026-01-15T03:00:00Z", "sensor": "S1", "kind": "rvr", "value": 1800, "value": 100, "status": "ok" },
              { "time": "2026-01-15T03:00:00Z", "sensor": "S2", "kind": "rvr", "value": 1800, "status": "ok" }
            ] }
            """);

        Assert.Equal("S2", Assert.Single(result.Readings).SensorId);
        var rejection = Assert.Single(result.Rejections);
        Assert.Equal(0, rejection.Index);
        Assert.Equal(RejectReason.Malformed, rejection.Reason);
        Assert.Equal("field \"value\" is given more than once", rejection.Detail);
        Assert.Equal([1], result.Indexes);
    }

    [Fact]
    public void DuplicateFieldWrittenWithAnEscape_IsStillADuplicate()
    {
        var result = Parse("""{ "readings": [ { "time": "2026-01-15T03:00:00Z", "sensor": "S1", "kind": "rvr", "value": 1800, "val\u0075e": 100, "status": "ok" } ] }""");

        Assert.Empty(result.Readings);
        Assert.Equal("field \"value\" is given more than once", Assert.Single(result.Rejections).Detail);
    }

    [Fact]
    public void DuplicateReadingsArray_RefusesTheDocument()
    {
        var ex = Assert.Throws<FeedFormatException>(() => Parse("""{ "readings": [], "readings": [ {} ] }"""));

        Assert.Equal("body names \"readings\" more than once", ex.Message);
    }

    [Theory]
    [InlineData(@"S1\n", "sensor contains a control character (U+000A at position 2)")]
    [InlineData(@"S\u00001", "sensor contains a control character (U+0000 at position 1)")]
    [InlineData(@"S1\u0085", "sensor contains a control character (U+0085 at position 2)")]
    public void ControlCharacterInSensorId_IsRejectedNamingIt(string jsonSensor, string expectedStart)
    {
        var result = Parse(Item(sensor: $"\"{jsonSensor}\""));

        Assert.Empty(result.Readings);
        var rejection = Assert.Single(result.Rejections);
        Assert.StartsWith(expectedStart, rejection.Detail, StringComparison.Ordinal);
        Assert.DoesNotContain(rejection.Detail, char.IsControl);
        Assert.Null(rejection.SensorId);
    }

    [Fact]
    public void ControlCharacterAfterTheTime_IsRejected()
    {
        // A trailing newline used to pass: the pattern ended in '$', which also matches before a final '\n'.
        var result = Parse(Item(time: @"2026-01-15T03:00:00Z\n"));

        Assert.Empty(result.Readings);
        Assert.StartsWith("time contains a control character (U+000A at position 20)", Assert.Single(result.Rejections).Detail, StringComparison.Ordinal);
    }

    [Fact]
    public void ItemLimit_IsTheCallersWhenGiven()
    {
        var items = string.Join(",", Enumerable.Repeat("{}", 4));

        var ex = Assert.Throws<FeedItemLimitException>(() => ReadingJsonParser.Parse(Encoding.UTF8.GetBytes("{ \"readings\": [" + items + "] }"), 3));

        Assert.Equal("\"readings\" has 4 items; at most 3 are accepted per document", ex.Message);
    }
}
