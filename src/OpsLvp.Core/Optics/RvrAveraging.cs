using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// Means of RVR samples: 1-minute for local reports and ATS displays (from memory), 10-minute for METAR; after a
/// marked discontinuity only the values after it are used (ICAO Annex 3; ICAO/WMO METCE).
/// </summary>
/// <remarks>
/// A window ending at <c>end</c> of length <c>w</c> holds the samples with <c>end − w &lt; Time ≤ end</c>
/// (start exclusive, end inclusive), so back-to-back windows never share a sample. The mean is the arithmetic mean of
/// the samples' unrounded values; sensors sample at a fixed rate, so it is not time-weighted. Round the mean with
/// <c>RvrReporting.Report</c> afterwards, never the samples before. A discontinuity at time <c>d</c> keeps only
/// samples with <c>Time ≥ d</c> (the first value of the new regime is taken as the one at <c>d</c>); a <c>d</c> before
/// the window has no effect. No samples in the window gives <c>null</c>.
/// </remarks>
public static class RvrAveraging
{
    /// <summary>One minute.</summary>
    public static readonly TimeSpan OneMinute = TimeSpan.FromMinutes(1);

    /// <summary>Ten minutes.</summary>
    public static readonly TimeSpan TenMinutes = TimeSpan.FromMinutes(10);

    /// <summary>The mean over the minute ending at <paramref name="end"/>.</summary>
    public static Metres? OneMinuteMean(IEnumerable<RvrSample> samples, DateTimeOffset end, DateTimeOffset? discontinuityAt = null) =>
        Mean(samples, end, OneMinute, discontinuityAt);

    /// <summary>The mean over the ten minutes ending at <paramref name="end"/>.</summary>
    public static Metres? TenMinuteMean(IEnumerable<RvrSample> samples, DateTimeOffset end, DateTimeOffset? discontinuityAt = null) =>
        Mean(samples, end, TenMinutes, discontinuityAt);

    /// <summary>
    /// The mean over (end − window, end]. <paramref name="window"/> must be positive, else
    /// <see cref="ArgumentOutOfRangeException"/>; a sample with a non-finite or negative value gives
    /// <see cref="ArgumentException"/>.
    /// </summary>
    public static Metres? Mean(IEnumerable<RvrSample> samples, DateTimeOffset end, TimeSpan window, DateTimeOffset? discontinuityAt = null)
    {
        ArgumentNullException.ThrowIfNull(samples);
        if (window <= TimeSpan.Zero)
        {
            throw new ArgumentOutOfRangeException(nameof(window), window, "averaging window must be positive");
        }
        var start = end - window;
        var sum = 0.0;
        var count = 0;
        foreach (var s in samples)
        {
            if (s.Time <= start || s.Time > end || (discontinuityAt is { } d && s.Time < d))
            {
                continue;
            }
            if (!double.IsFinite(s.Value.Value) || s.Value.Value < 0)
            {
                throw new ArgumentException($"RVR sample at {s.Time:O} has an invalid value {s.Value.Value}", nameof(samples));
            }
            sum += s.Value.Value;
            count++;
        }
        return count == 0 ? null : new Metres(sum / count);
    }
}
