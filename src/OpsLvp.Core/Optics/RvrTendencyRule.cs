using OpsLvp.Core.Reporting;

namespace OpsLvp.Core.Optics;

/// <summary>
/// The tendency rule: compare the mean of the first 5 minutes of the 10-minute period with the mean of the last
/// 5 minutes; a difference of 100 m or more gives <c>U</c> or <c>D</c>, otherwise <c>N</c>
/// (ICAO Annex 3, App 3, §4.3.6.6 as cited by WMO METCE / IWXXM).
/// </summary>
/// <remarks>
/// The period ending at <c>end</c> is split into (end − 10 min, end − 5 min] and (end − 5 min, end], each averaged with
/// <see cref="RvrAveraging.Mean"/> on unrounded values. Exactly 100 m counts (≥). If either half has no samples the
/// tendency is not determinable and the result is <c>null</c>.
/// </remarks>
public static class RvrTendencyRule
{
    /// <summary>The difference between the two half-period means that makes a tendency, 100 m.</summary>
    public const double MinimumChangeMetres = 100;

    private static readonly TimeSpan _halfPeriod = TimeSpan.FromMinutes(5);

    /// <summary>The tendency of the 10-minute period ending at <paramref name="end"/>, or <c>null</c> if not determinable.</summary>
    public static RvrTendency? Assess(IEnumerable<RvrSample> samples, DateTimeOffset end)
    {
        ArgumentNullException.ThrowIfNull(samples);
        var list = samples as IReadOnlyCollection<RvrSample> ?? samples.ToList();
        var first = RvrAveraging.Mean(list, end - _halfPeriod, _halfPeriod);
        var last = RvrAveraging.Mean(list, end, _halfPeriod);
        if (first is not { } f || last is not { } l)
        {
            return null;
        }
        var change = l.Value - f.Value;
        if (change >= MinimumChangeMetres)
        {
            return RvrTendency.Up;
        }
        return change <= -MinimumChangeMetres ? RvrTendency.Down : RvrTendency.NoChange;
    }

    /// <summary>The METAR letter: <c>'U'</c>, <c>'D'</c> or <c>'N'</c>.</summary>
    public static char ToMetarLetter(RvrTendency tendency) => tendency switch
    {
        RvrTendency.Up => 'U',
        RvrTendency.Down => 'D',
        RvrTendency.NoChange => 'N',
        _ => throw new ArgumentOutOfRangeException(nameof(tendency), tendency, "unknown tendency"),
    };
}
