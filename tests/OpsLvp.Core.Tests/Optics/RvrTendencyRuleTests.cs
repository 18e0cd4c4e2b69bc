using OpsLvp.Core.Optics;
using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class RvrTendencyRuleTests
{
    // Invented sample times and values.
    private static readonly DateTimeOffset _end = new(2026, 1, 15, 6, 0, 0, TimeSpan.Zero);

    private static List<RvrSample> Period(double firstHalfMetres, double lastHalfMetres) =>
        Enumerable.Range(0, 10)
            .Select(i => new RvrSample(_end.AddMinutes(-i), new Metres(i < 5 ? lastHalfMetres : firstHalfMetres)))
            .ToList();

    [Theory]
    // Mean of first 5 min vs last 5 min; a difference of 100 m or more → U or D, else N —
    // ICAO Annex 3, App 3, §4.3.6.6 as cited by WMO METCE / IWXXM
    [InlineData(500, 600, RvrTendency.Up)]
    [InlineData(500, 599.9, RvrTendency.NoChange)]
    [InlineData(600, 500, RvrTendency.Down)]
    [InlineData(600, 500.1, RvrTendency.NoChange)]
    [InlineData(550, 550, RvrTendency.NoChange)]
    [InlineData(300, 1200, RvrTendency.Up)]
    public void Tendency_AroundTheHundredMetreRule_GivesUDN(double first, double last, RvrTendency expected)
    {
        Assert.Equal(expected, RvrTendencyRule.Assess(Period(first, last), _end));
    }

    [Fact]
    public void Tendency_SplitsThePeriodAtFiveMinutes()
    {
        // A sample exactly 5 min before the end belongs to the first half (windows are start-exclusive, end-inclusive)
        RvrSample[] samples =
        [
            new(_end.AddMinutes(-9), new Metres(400)),
            new(_end.AddMinutes(-5), new Metres(400)),
            new(_end.AddMinutes(-4), new Metres(500)),
            new(_end, new Metres(500)),
        ];

        Assert.Equal(RvrTendency.Up, RvrTendencyRule.Assess(samples, _end));
    }

    [Fact]
    public void Tendency_WithAnEmptyHalf_IsNotDeterminable()
    {
        RvrSample[] samples = [new(_end.AddMinutes(-2), new Metres(500)), new(_end, new Metres(700))];

        Assert.Null(RvrTendencyRule.Assess(samples, _end));
    }

    [Theory]
    // METAR suffixes U/D/N — WMO-No. 306, FM 15
    [InlineData(RvrTendency.Up, 'U')]
    [InlineData(RvrTendency.Down, 'D')]
    [InlineData(RvrTendency.NoChange, 'N')]
    public void Tendency_MetarLetter_IsUDN(RvrTendency tendency, char letter)
    {
        Assert.Equal(letter, RvrTendencyRule.ToMetarLetter(tendency));
    }
}
