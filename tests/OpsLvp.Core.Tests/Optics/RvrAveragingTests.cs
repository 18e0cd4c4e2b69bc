using OpsLvp.Core.Optics;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Optics;

public sealed class RvrAveragingTests
{
    // Invented sample times and values.
    private static readonly DateTimeOffset _end = new(2026, 1, 15, 6, 0, 0, TimeSpan.Zero);

    private static RvrSample At(double secondsBeforeEnd, double metres) => new(_end.AddSeconds(-secondsBeforeEnd), new Metres(metres));

    [Fact]
    public void OneMinuteMean_TakesSamplesAfterStartUpToAndIncludingEnd()
    {
        // 1-minute means for local reports and ATS displays — ICAO Annex 3 (from memory); window bounds decided in RvrAveraging
        RvrSample[] samples = [At(60, 9999), At(45, 400), At(30, 500), At(0, 600), At(-1, 9999)];

        Assert.Equal(500, RvrAveraging.OneMinuteMean(samples, _end)!.Value.Value, 1e-9);
    }

    [Fact]
    public void TenMinuteMean_AveragesTheWholePeriod()
    {
        // 10-minute mean for METAR — ICAO Annex 3; ICAO/WMO METCE
        var samples = Enumerable.Range(0, 10).Select(i => At(i * 60, 300 + (i * 20))).ToList();

        Assert.Equal(390, RvrAveraging.TenMinuteMean(samples, _end)!.Value.Value, 1e-9);
    }

    [Fact]
    public void TenMinuteMean_AfterMarkedDiscontinuity_UsesOnlyValuesAfterIt()
    {
        // After a marked discontinuity, only values after it — ICAO Annex 3; ICAO/WMO METCE
        RvrSample[] samples = [At(500, 1500), At(400, 1500), At(180, 400), At(120, 500), At(60, 600)];
        var discontinuity = _end.AddSeconds(-180);

        Assert.Equal(500, RvrAveraging.TenMinuteMean(samples, _end, discontinuity)!.Value.Value, 1e-9);
        Assert.Equal(900, RvrAveraging.TenMinuteMean(samples, _end)!.Value.Value, 1e-9);
    }

    [Fact]
    public void Mean_WithNoSamplesInWindow_IsNull()
    {
        Assert.Null(RvrAveraging.OneMinuteMean([At(120, 500)], _end));
    }

    [Fact]
    public void Mean_WithNonPositiveWindow_IsRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => RvrAveraging.Mean([At(0, 500)], _end, TimeSpan.Zero));
    }

    [Fact]
    public void Mean_WithInvalidSampleValue_IsRejected()
    {
        var ex = Assert.Throws<ArgumentException>(() => RvrAveraging.OneMinuteMean([At(10, double.NaN)], _end));
        Assert.Contains("invalid value", ex.Message, StringComparison.Ordinal);
    }
}
