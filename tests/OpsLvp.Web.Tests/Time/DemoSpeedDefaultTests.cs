using System.Text.Json;
using OpsLvp.Web.Tests.Review;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Tests.Time;

/// <summary>
/// A newcomer running the demo with no configuration sees the first phase change within about three real minutes:
/// the invented demo night (seed-demo/) reaches its first transition 2 h 37 min after its first reading.
/// </summary>
public sealed class DemoSpeedDefaultTests
{
    private static readonly TimeSpan FirstChangeWithin = TimeSpan.FromMinutes(3);

    private static TimeSpan RealTimeToFirstTransition(double speed)
    {
        var night = DemoNightSource.Record;
        var start = night.Readings.Min(r => r.Time);
        var first = night.Events.First(e => e.Name == "transition").At;
        return (first - start) / speed;
    }

    [Fact]
    public void DefaultSpeed_ShowsTheDemoNightsFirstTransitionWithinThreeMinutes()
    {
        var speed = new DemoOptions().Speed;
        Assert.Equal(60, speed);
        Assert.True(RealTimeToFirstTransition(speed) <= FirstChangeWithin, $"first transition after {RealTimeToFirstTransition(speed)} real time at ×{speed}");
    }

    [Fact]
    public void ShippedAppSettings_UseTheSameSpeed()
    {
        // appsettings.json overrides the class default, so it must carry the same value.
        var path = Path.Combine(RepoRoot(), "src", "OpsLvp.Web", "appsettings.json");
        using var doc = JsonDocument.Parse(File.ReadAllText(path));
        Assert.Equal(new DemoOptions().Speed, doc.RootElement.GetProperty("Demo").GetProperty("Speed").GetDouble());
    }

    private static string RepoRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.sln")))
            {
                return dir.FullName;
            }
        }
        throw new InvalidOperationException("OpsLvp.sln not found above " + AppContext.BaseDirectory);
    }
}
