using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// The observer's illuminance threshold E_T (lux) from the background luminance B (cd/m²).
/// Bands (ICAO Annex 3, Attachment D — from memory): night B ≤ 50 → 8×10⁻⁷ lx; intermediate 50 &lt; B &lt; 1000 →
/// 10⁻⁵ lx; normal day 1000 ≤ B ≤ 12 000 → 10⁻⁴ lx; bright day B &gt; 12 000 → 10⁻³ lx. Annex 3 writes the
/// intermediate band as 51–999; a non-integer B between 50 and 51 is taken as intermediate (decided here).
/// </summary>
public static class IlluminanceThreshold
{
    /// <summary>Night threshold, 8×10⁻⁷ lx (Annex 3, Attachment D — from memory).</summary>
    public static readonly Lux Night = new(8e-7);

    /// <summary>Intermediate threshold, 10⁻⁵ lx (Annex 3, Attachment D — from memory).</summary>
    public static readonly Lux Intermediate = new(1e-5);

    /// <summary>Normal-day threshold, 10⁻⁴ lx (Annex 3, Attachment D — from memory).</summary>
    public static readonly Lux Day = new(1e-4);

    /// <summary>Bright-day threshold, 10⁻³ lx (Annex 3, Attachment D — from memory).</summary>
    public static readonly Lux BrightDay = new(1e-3);

    /// <summary>
    /// The band to use when no valid background luminance is known (docs/engine.md R19): the one whose threshold is the
    /// highest, so the lights range is the lowest (Allard's law: a higher E_T always shortens the range; common practice
    /// to fail towards the lower RVR). Chosen by comparing the thresholds, not by name: it is
    /// <see cref="LuminanceBand.BrightDay"/>, 10⁻³ lx.
    /// </summary>
    public static LuminanceBand UnknownLuminanceBand { get; } = Enum.GetValues<LuminanceBand>().MaxBy(b => ForBand(b).Value);

    /// <summary>The band of a background luminance. B must be finite and ≥ 0 cd/m², else <see cref="ArgumentOutOfRangeException"/>.</summary>
    public static LuminanceBand BandOf(CandelaPerSquareMetre background)
    {
        var b = CheckLuminance(background);
        return b switch
        {
            <= 50 => LuminanceBand.Night,
            < 1000 => LuminanceBand.Intermediate,
            <= 12_000 => LuminanceBand.Day,
            _ => LuminanceBand.BrightDay,
        };
    }

    /// <summary>The threshold of a band.</summary>
    public static Lux ForBand(LuminanceBand band) => band switch
    {
        LuminanceBand.Night => Night,
        LuminanceBand.Intermediate => Intermediate,
        LuminanceBand.Day => Day,
        LuminanceBand.BrightDay => BrightDay,
        _ => throw new ArgumentOutOfRangeException(nameof(band), band, "unknown luminance band"),
    };

    /// <summary>
    /// E_T for <paramref name="background"/> under <paramref name="model"/>. Bands accept any finite B ≥ 0;
    /// <see cref="ThresholdModel.Continuous"/> needs B &gt; 0 (it takes log₁₀B). Otherwise
    /// <see cref="ArgumentOutOfRangeException"/>.
    /// </summary>
    public static Lux FromBackground(CandelaPerSquareMetre background, ThresholdModel model = ThresholdModel.AnnexBands)
    {
        switch (model)
        {
            case ThresholdModel.AnnexBands:
                return ForBand(BandOf(background));
            case ThresholdModel.Continuous:
                var b = CheckLuminance(background);
                if (b <= 0)
                {
                    throw new ArgumentOutOfRangeException(nameof(background), b, "the continuous threshold form needs a background luminance greater than 0 cd/m²");
                }
                var x = Math.Log10(b);
                return new Lux(Math.Pow(10, (0.05 * x * x) + (0.573 * x) - 6.667));
            default:
                throw new ArgumentOutOfRangeException(nameof(model), model, "unknown threshold model");
        }
    }

    /// <summary>
    /// A representative luminance for a band, for callers that know the period but have no luminance meter:
    /// night 1, intermediate 200, day 4000, bright day 20 000 cd/m². Each lies inside its band (invented; chosen near
    /// the middle of the band on a log scale), so under <see cref="ThresholdModel.AnnexBands"/> it gives exactly the
    /// band's threshold.
    /// </summary>
    public static CandelaPerSquareMetre RepresentativeLuminance(LuminanceBand band) => band switch
    {
        LuminanceBand.Night => new(1),
        LuminanceBand.Intermediate => new(200),
        LuminanceBand.Day => new(4000),
        LuminanceBand.BrightDay => new(20_000),
        _ => throw new ArgumentOutOfRangeException(nameof(band), band, "unknown luminance band"),
    };

    private static double CheckLuminance(CandelaPerSquareMetre background)
    {
        if (!double.IsFinite(background.Value) || background.Value < 0)
        {
            throw new ArgumentOutOfRangeException(nameof(background), background.Value, "background luminance must be a finite number of cd/m², 0 or more");
        }
        return background.Value;
    }
}
