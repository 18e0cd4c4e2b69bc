using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>One scenario row: when it plays (offset from the scenario's first row) and what it reads.</summary>
public sealed record ScenarioReading(TimeSpan Offset, string SensorId, ReadingKind Kind, double Value, ReadingStatus Status)
{
    public Reading At(DateTimeOffset time) => new(time, SensorId, Kind, Value, Status);
}
