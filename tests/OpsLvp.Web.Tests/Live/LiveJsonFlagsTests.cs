using System.Text.Json;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Live;

/// <summary>docs/engine.md R19–R22: <c>/api/state</c> and the hub carry a value's flags beside it. Values invented.</summary>
public sealed class LiveJsonFlagsTests
{
    [Fact]
    public void MeasuredValue_WritesItsFlagsAsWords()
    {
        var at = new DateTimeOffset(2026, 1, 15, 4, 0, 0, TimeSpan.Zero);
        var flagged = new MeasuredValue(400, "fs1", "09 TDZ", at, 10, false, ReadingFlags.LuminanceUnknown | ReadingFlags.LightStepUnknown);
        using var doc = JsonDocument.Parse(JsonSerializer.Serialize(flagged, LiveJson.Options));
        Assert.Equal("luminanceUnknown, lightStepUnknown", doc.RootElement.GetProperty("flags").GetString());
        using var plain = JsonDocument.Parse(JsonSerializer.Serialize(flagged with { Flags = ReadingFlags.None }, LiveJson.Options));
        Assert.Equal("none", plain.RootElement.GetProperty("flags").GetString());
    }
}
