using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Tests.Reporting;

public sealed class ObscurationClassifierTests
{
    [Theory]
    // FG below 1000 m; BR from 1000 to 5000 m — EU Part-MET AMC/GM; common practice (both ends of BR inclusive: decided here)
    [InlineData(0.0, Obscuration.Fog, "FG")]
    [InlineData(550.0, Obscuration.Fog, "FG")]
    [InlineData(999.9, Obscuration.Fog, "FG")]
    [InlineData(1000.0, Obscuration.Mist, "BR")]
    [InlineData(1000.1, Obscuration.Mist, "BR")]
    [InlineData(4999.9, Obscuration.Mist, "BR")]
    [InlineData(5000.0, Obscuration.Mist, "BR")]
    [InlineData(5000.1, Obscuration.None, null)]
    [InlineData(10_000.0, Obscuration.None, null)]
    public void Visibility_AroundFogAndMistBounds_ClassifiesByBand(double metres, Obscuration expected, string? code)
    {
        var obscuration = ObscurationClassifier.Classify(new Metres(metres));

        Assert.Equal(expected, obscuration);
        Assert.Equal(code, ObscurationClassifier.ToMetarCode(obscuration));
    }

    [Fact]
    public void Visibility_Negative_IsRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => ObscurationClassifier.Classify(new Metres(-5)));
    }
}
