using System.Diagnostics;
using System.Globalization;
using OpsLvp.Data;

namespace OpsLvp.Benchmarks.Live;

/// <summary>
/// What the live harnesses that start cluster nodes share: waiting for a condition (an election, an engine restored),
/// a progress line on the console, and the settings of a node on PostgreSQL.
/// </summary>
internal static class HarnessSupport
{
    /// <summary>How long <c>WaitAsync</c> waits before giving up: generous, the machine may be loaded.</summary>
    public static readonly TimeSpan WaitLimit = TimeSpan.FromMinutes(2);

    /// <summary>Polls <paramref name="condition"/> every 100 ms until it holds.</summary>
    /// <exception cref="TimeoutException">Not held within <see cref="WaitLimit"/>; the message names the suite and <paramref name="what"/>.</exception>
    public static Task WaitAsync(string suite, Func<bool> condition, string what) =>
        WaitAsync(suite, () => Task.FromResult(condition()), what);

    /// <summary>Polls <paramref name="condition"/> (asked of another process, say) every 100 ms until it holds.</summary>
    /// <exception cref="TimeoutException">Not held within <see cref="WaitLimit"/>; the message names the suite and <paramref name="what"/>.</exception>
    public static async Task WaitAsync(string suite, Func<Task<bool>> condition, string what)
    {
        var clock = Stopwatch.StartNew();
        while (!await condition())
        {
            if (clock.Elapsed > WaitLimit)
            {
                throw new TimeoutException($"{suite}: waited {WaitLimit.TotalMinutes:0} minutes for {what}");
            }
            await Task.Delay(100);
        }
    }

    /// <summary>One line on the console: <c>[suite HH:mm:ss] what</c> (UTC).</summary>
    public static void Progress(string suite, string what) =>
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture, $"[{suite} {TimeProvider.System.GetUtcNow():HH:mm:ss}] {what}"));

    public static string Ms(double ms) => string.Create(CultureInfo.InvariantCulture, $"{ms:0.00} ms");

    /// <summary>
    /// A node on PostgreSQL <paramref name="connectionString"/> named <paramref name="node"/>: one installation, one
    /// anchor key (<paramref name="anchorKeyFile"/> in <paramref name="shared"/>, docs/audit.md "Anchors"), each node its
    /// own anchor log. With <paramref name="redis"/>, in the cluster through Redis (and its key prefix
    /// <paramref name="redisPrefix"/> when given); <paramref name="extra"/> added last.
    /// </summary>
    public static Dictionary<string, string?> PostgresNode(string connectionString, string shared, string node, string anchorKeyFile,
        string? redis = null, string? redisPrefix = null, IReadOnlyDictionary<string, string?>? extra = null)
    {
        var settings = new Dictionary<string, string?>
        {
            [OpsLvpDatabase.ProviderSetting] = OpsLvpDatabase.PostgresProvider,
            [OpsLvpDatabase.PostgresConnectionStringSetting] = connectionString,
            ["Cluster:NodeId"] = node,
            ["Anchors:KeyPath"] = Path.Combine(shared, anchorKeyFile),
            ["Anchors:LogPath"] = Path.Combine(shared, node + "-anchors.jsonl"),
        };
        if (redis is not null)
        {
            settings["Cluster:Redis"] = redis;
        }
        if (redisPrefix is not null)
        {
            settings["Cluster:RedisPrefix"] = redisPrefix;
        }
        foreach (var (key, value) in extra ?? new Dictionary<string, string?>())
        {
            settings[key] = value;
        }
        return settings;
    }
}
