using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>
/// A restart does not shorten the 1-minute RVR mean of a raw sensor: the host rebuilds the averaging history from the
/// readings received in the last 10 minutes, so the first derived RVR after the restart equals what an uninterrupted
/// run derives (the reference is Core's <see cref="RvrDerivation"/> fed the same raw readings). Values invented.
/// </summary>
public sealed class AveragingRestartTests
{
    [Fact]
    public async Task FirstDerivedRvrAfterARestart_IsTheMeanOverReadingsFromBeforeIt()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var path = LiveTestProfile.Write(folder);
            var settings = LiveTestProfile.Settings(path);
            var t = DateTimeOffset.UtcNow.AddSeconds(-40);
            // Extinction per km of the forward-scatter meter: thick twice, then thin.
            (DateTimeOffset At, double PerKm)[] raw = [(t, 12.0), (t.AddSeconds(10), 12.0), (t.AddSeconds(20), 2.0)];
            await using (var first = OpsLvpApp.Start(settings, folder))
            {
                await LiveClient.PushAsync(first, LiveClient.Item(raw[0].At, LiveTestProfile.Mid, "extinction", raw[0].PerKm));
                await WaitForDerivedAsync(first, raw[0].At);
                await LiveClient.PushAsync(first, LiveClient.Item(raw[1].At, LiveTestProfile.Mid, "extinction", raw[1].PerKm));
                await WaitForDerivedAsync(first, raw[1].At);
            }

            await using var second = OpsLvpApp.Start(settings, folder);
            await LiveClient.PushAsync(second, LiveClient.Item(raw[2].At, LiveTestProfile.Mid, "extinction", raw[2].PerKm));
            var afterRestart = await WaitForDerivedAsync(second, raw[2].At);

            var profile = ProfileValidator.LoadValidated(path);
            var uninterrupted = new RvrDerivation(profile);
            var expected = raw.Select(r => uninterrupted.Observe(Raw(r.At, r.PerKm)).Single()).ToList()[^1];
            var fromNothing = new RvrDerivation(profile).Observe(Raw(raw[2].At, raw[2].PerKm)).Single();
            Assert.NotEqual(fromNothing.Value, expected.Value); // the check can tell the two apart
            Assert.Equal(expected.Value, afterRestart.Value);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    private static Reading Raw(DateTimeOffset at, double perKm) =>
        new(DateTimeOffset.Parse(LiveClient.Time(at), System.Globalization.CultureInfo.InvariantCulture), LiveTestProfile.Mid, ReadingKind.Extinction, perKm);

    /// <summary>The derived RVR of the forward-scatter meter once the engine holds the one for <paramref name="at"/>.</summary>
    private static async Task<Reading> WaitForDerivedAsync(OpsLvpApp app, DateTimeOffset at)
    {
        var engine = app.Services.GetRequiredService<LiveEngineHost>();
        var key = EngineState.SensorKey(LiveTestProfile.Mid, ReadingKind.Rvr);
        var wanted = DateTimeOffset.Parse(LiveClient.Time(at), System.Globalization.CultureInfo.InvariantCulture);
        var deadline = DateTime.UtcNow.AddSeconds(15);
        while (true)
        {
            if (engine.State?.Latest.TryGetValue(key, out var derived) == true && derived.Time == wanted)
            {
                return derived;
            }
            Assert.True(DateTime.UtcNow < deadline, $"no derived RVR for {wanted:O} within 15 s");
            await Task.Delay(50);
        }
    }
}
