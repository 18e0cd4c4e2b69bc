using System.Globalization;

namespace OpsLvp.Benchmarks.Live;

/// <summary>Latency samples in milliseconds with nearest-rank percentiles.</summary>
public sealed class Latencies(IReadOnlyList<double> samples)
{
    private readonly double[] _sorted = [.. samples.Order()];

    public int Count => _sorted.Length;

    public double P50 => Percentile(50);

    public double P99 => Percentile(99);

    public double Max => _sorted.Length == 0 ? double.NaN : _sorted[^1];

    public double Percentile(double p)
    {
        if (_sorted.Length == 0)
        {
            return double.NaN;
        }
        var rank = (int)Math.Ceiling(p / 100 * _sorted.Length);
        return _sorted[Math.Clamp(rank - 1, 0, _sorted.Length - 1)];
    }

    public override string ToString() =>
        string.Create(CultureInfo.InvariantCulture, $"p50 {P50:0.00} ms, p99 {P99:0.00} ms, max {Max:0.00} ms (n={Count})");
}
