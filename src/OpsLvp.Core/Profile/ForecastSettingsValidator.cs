namespace OpsLvp.Core.Profile;

/// <summary>Checks the optional profile section <c>forecast</c> (docs/forecasts.md); each problem names its field.</summary>
public static class ForecastSettingsValidator
{
    /// <summary>The longest TAF validity period, 30 hours (WMO-No. 306 FM 51 — from memory), as the longest useful look-ahead.</summary>
    public const int MaxHorizonMinutes = 30 * 60;

    /// <summary>Every problem of <paramref name="settings"/> (none when null: the section is optional).</summary>
    public static IReadOnlyList<ValidationProblem> Validate(ForecastSettings? settings)
    {
        var problems = new List<ValidationProblem>();
        if (settings is null)
        {
            return problems;
        }
        if (settings.HorizonMinutes is <= 0 or > MaxHorizonMinutes)
        {
            problems.Add(new("forecast.horizonMinutes", $"is {settings.HorizonMinutes}; expected a look-ahead in minutes from 1 to {MaxHorizonMinutes} (30 h, the longest TAF validity)"));
        }
        Positive(problems, "forecast.visibilityBelowM", settings.VisibilityBelowM, "m");
        Positive(problems, "forecast.ceilingBelowFt", settings.CeilingBelowFt, "ft");
        if (settings.VisibilityBelowM is null && settings.CeilingBelowFt is null)
        {
            problems.Add(new("forecast", "sets neither visibilityBelowM nor ceilingBelowFt; expected at least one value that counts as deterioration"));
        }
        return problems;
    }

    private static void Positive(List<ValidationProblem> problems, string field, double? value, string unit)
    {
        if (value is { } v && !(double.IsFinite(v) && v > 0))
        {
            problems.Add(new(field, $"is {v}; expected a value in {unit} > 0"));
        }
    }
}
