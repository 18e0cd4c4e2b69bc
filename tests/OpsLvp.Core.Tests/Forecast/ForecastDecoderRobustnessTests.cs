using CsCheck;
using OpsLvp.Core.Forecast;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// Bad input gets a clear error, never a crash (project rule): random group soups either decode or are refused, and
/// whatever decodes can be placed in time and judged by the trigger. Groups are invented.
/// </summary>
public sealed class ForecastDecoderRobustnessTests
{
    private static readonly string[] s_pieces =
    [
        "TAF", "AMD", "COR", "CNL", "NIL", "XDMO", "010500Z", "312300Z", "0106/0206", "0100/0124", "0124/0206", "3118/0124",
        "BECMG", "TEMPO", "PROB30", "PROB40", "PROB50", "FM011800", "FM312330", "FM0700", "TL0800", "AT0730", "TL2400",
        "NOSIG", "24005KT", "9999", "0300", "CAVOK", "1", "1/2SM", "1/0SM", "M1/4SM", "P6SM", "FG", "FZFG", "NSW", "NSC",
        "SKC", "VV002", "VV///", "BKN002", "///015", "TX12/0114Z", "RMK", "METAR", "=", "/", "0000/0000", "9999/9999",
        "é", "\t",
    ];

    private static readonly ForecastSettings s_settings = new()
    {
        HorizonMinutes = 180, VisibilityBelowM = 1000, CeilingBelowFt = 300, CountTempo = true, CountProb30 = true, CountProb40 = true,
    };

    [Fact]
    public void RandomTafGroups_EitherDecodeOrAreRefusedWithAMessage()
    {
        var receivedAt = new DateTimeOffset(2026, 3, 1, 5, 0, 0, TimeSpan.Zero);
        // Half the samples start with a good header, so the body and change groups get exercised too.
        Gen.Select(Gen.Bool, Gen.OneOf(Gen.OneOf(s_pieces), Gen.String).Array[0, 25])
            .Select((header, parts) => (header ? "TAF XDMO 010500Z 0106/0206 " : "") + string.Join(' ', parts))
            .Sample(text =>
            {
                try
                {
                    var report = TafDecoder.Decode(text);
                    _ = TafJson.Write(report);
                    if (!report.Nil)
                    {
                        var placed = ResolvedForecast.FromTaf(report, receivedAt);
                        Assert.All(placed.Parts, p => Assert.True(p.From < p.Until));
                        _ = ForecastTrigger.Evaluate([placed], receivedAt.AddHours(1), s_settings);
                    }
                }
                catch (ForecastFormatException ex)
                {
                    Assert.False(string.IsNullOrWhiteSpace(ex.Message));
                }
            }, iter: 5000);
    }

    [Fact]
    public void RandomTrendGroups_EitherDecodeOrAreRefusedWithAMessage()
    {
        var observedAt = new DateTimeOffset(2026, 3, 1, 23, 50, 0, TimeSpan.Zero);
        Gen.Select(Gen.Bool, Gen.OneOf(Gen.OneOf(s_pieces), Gen.String).Array[0, 25])
            .Select((start, parts) => (start ? "TEMPO " : "") + string.Join(' ', parts))
            .Sample(text =>
            {
                try
                {
                    var trend = TrendDecoder.Decode(text);
                    _ = TafJson.Write(trend);
                    var placed = ResolvedForecast.FromTrend(trend, "XDMO", text, observedAt);
                    Assert.All(placed.Parts, p => Assert.True(p.From < p.Until && p.Until <= placed.ValidUntil));
                    _ = ForecastTrigger.Evaluate([placed], observedAt, s_settings);
                }
                catch (ForecastFormatException ex)
                {
                    Assert.False(string.IsNullOrWhiteSpace(ex.Message));
                }
            }, iter: 5000);
    }
}
