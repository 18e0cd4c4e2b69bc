namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>Waits for a condition that background services make true, failing with a message after a timeout.</summary>
public static class Eventually
{
    public static async Task<T> ValueAsync<T>(Func<T?> probe, Func<T, bool> done, string what, TimeSpan? timeout = null)
        where T : class
    {
        var deadline = DateTime.UtcNow + (timeout ?? TimeSpan.FromSeconds(10));
        while (true)
        {
            var value = probe();
            if (value is not null && done(value))
            {
                return value;
            }

            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out waiting for {what}; last value: {value?.ToString() ?? "null"}");
            }

            await Task.Delay(25);
        }
    }

    /// <summary>Waits until <paramref name="condition"/> holds (default 10 s).</summary>
    public static async Task TrueAsync(Func<bool> condition, string what, TimeSpan? timeout = null)
    {
        var deadline = DateTime.UtcNow + (timeout ?? TimeSpan.FromSeconds(10));
        while (!condition())
        {
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"timed out waiting for {what}");
            }

            await Task.Delay(25);
        }
    }
}
