using System.Text.Json.Nodes;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Profile;

/// <summary>
/// Profile section <c>forecast</c> (docs/forecasts.md, docs/profile.md): optional, and every problem names its field.
/// The values are invented and illustrative; 30 h is the longest TAF validity (WMO-No. 306 FM 51 — from memory).
/// </summary>
public sealed class ForecastSettingsValidatorTests
{
    private static ForecastSettings Good() => new()
    {
        HorizonMinutes = 180,
        VisibilityBelowM = 1000,
        CeilingBelowFt = 300,
        CountTempo = true,
        CountProb30 = false,
        CountProb40 = true,
    };

    private static ValidationProblem Single(ForecastSettings settings) =>
        Assert.Single(ProfileValidator.Validate(ProfileFixtures.Valid() with { Forecast = settings }).Problems);

    [Fact]
    public void ProfileWithoutForecastSection_IsStillValid()
    {
        Assert.Null(ProfileFixtures.Valid().Forecast);
        Assert.True(ProfileValidator.Validate(ProfileFixtures.Valid()).IsValid);
    }

    [Fact]
    public void GoodForecastSection_IsValid()
    {
        var result = ProfileValidator.Validate(ProfileFixtures.Valid() with { Forecast = Good() });
        Assert.True(result.IsValid, result.ToString());
    }

    [Theory]
    [InlineData(0)]
    [InlineData(-60)]
    [InlineData(1801)]
    public void HorizonOutOfRange_NamesTheHorizon(int minutes)
    {
        var p = Single(Good() with { HorizonMinutes = minutes });
        Assert.Equal("forecast.horizonMinutes", p.Field);
        Assert.Contains("from 1 to 1800", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void LongestTafValidity_IsAnAllowedHorizon()
    {
        Assert.Empty(ForecastSettingsValidator.Validate(Good() with { HorizonMinutes = 1800 }));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(-1)]
    [InlineData(double.NaN)]
    public void VisibilityNotPositive_NamesTheVisibility(double value)
    {
        var p = Single(Good() with { VisibilityBelowM = value });
        Assert.Equal("forecast.visibilityBelowM", p.Field);
        Assert.Contains("> 0", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void CeilingNotPositive_NamesTheCeiling()
    {
        Assert.Equal("forecast.ceilingBelowFt", Single(Good() with { CeilingBelowFt = 0 }).Field);
    }

    [Fact]
    public void NeitherVisibilityNorCeiling_NamesTheSection()
    {
        var p = Single(Good() with { VisibilityBelowM = null, CeilingBelowFt = null });
        Assert.Equal("forecast", p.Field);
        Assert.Contains("neither visibilityBelowM nor ceilingBelowFt", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void OnlyCeiling_IsEnough()
    {
        Assert.Empty(ForecastSettingsValidator.Validate(Good() with { VisibilityBelowM = null }));
    }

    [Fact]
    public void MissingCountChoice_IsAParseErrorNamingTheSection()
    {
        var json = JsonNode.Parse(ProfileLoader.Serialize(ProfileFixtures.Valid() with { Forecast = Good() }))!.AsObject();
        json["forecast"]!.AsObject().Remove("countProb30");
        var ex = Assert.Throws<ProfileException>(() => ProfileLoader.Parse(json.ToJsonString()));
        Assert.StartsWith("forecast", ex.Field, StringComparison.Ordinal);
        Assert.Contains("countProb30", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void DemoProfile_HasAValidForecastSection()
    {
        // seed-demo/profile.json: illustrative, invented values (docs/forecasts.md).
        var demo = ProfileValidator.LoadValidated(Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo", "profile.json"));
        Assert.Equal(Good(), demo.Forecast);
    }

    [Fact]
    public void ForecastSection_RoundTripsThroughJson()
    {
        var json = ProfileLoader.Serialize(ProfileFixtures.Valid() with { Forecast = Good() });
        Assert.Equal(Good(), ProfileLoader.Parse(json).Forecast);
    }
}
