using CsCheck;
using OpsLvp.Core.Metar;

namespace OpsLvp.Core.Tests.Metar;

/// <summary>Bad input gets a clear error, never a crash (project rule): random group soups either decode or are refused.</summary>
public sealed class MetarDecoderRobustnessTests
{
    private static readonly string[] s_pieces =
    [
        "METAR", "SPECI", "COR", "AUTO", "NIL", "XDMO", "010620Z", "24004KT", "0400", "0200NE", "9999", "CAVOK", "////",
        "R26L/0550N", "R08/M0050", "R15/0400V0800U", "R09/////", "R22/1200FT", "R", "R26/", "/", "//", "VV", "VV001",
        "VV///", "BKN", "BKN002", "OVC///", "///015", "FG", "+", "-", "VC", "RE", "FZFG", "NSC", "TEMPO", "NOSIG", "RMK",
        "WS", "ALL", "RWY", "Q1021", "M01/M02", "=", "Z", "00", "999999", "é", "\t",
    ];

    [Fact]
    public void RandomGroups_EitherDecodeOrAreRefusedWithAMessage()
    {
        Gen.OneOf(Gen.OneOf(s_pieces), Gen.String).Array[0, 25]
            .Select(parts => string.Join(' ', parts))
            .Sample(text =>
            {
                try
                {
                    var report = MetarDecoder.Decode(text);
                    _ = MetarJson.Write(report);
                    _ = report.Ceiling;
                }
                catch (MetarFormatException ex)
                {
                    Assert.False(string.IsNullOrWhiteSpace(ex.Message));
                }
            }, iter: 5000);
    }
}
