namespace OpsLvp.Core.Engine;

/// <summary>The keys the engine gives its alarms (stable: displays, acknowledgements and exports use them).</summary>
public static class AlarmKeys
{
    public const string RvrUnknown = "rvr-unknown";
    public const string CeilingUnknown = "ceiling-unknown";
    public const string Pending = "pending";
    public const string SafeguardsIncomplete = "safeguards-incomplete";

    /// <summary>A sensor silent past its maximum age, e.g. "feed-silent:RVR09T".</summary>
    public static string SensorSilent(string sensorId) => $"feed-silent:{sensorId}";

    /// <summary>A checklist item past its due time, e.g. "item-overdue:P1".</summary>
    public static string ItemOverdue(string itemId) => $"item-overdue:{itemId}";

    /// <summary>A downgrade of a runway direction in use, e.g. "capability-down:07L" (docs/engine.md R37).</summary>
    public static string CapabilityDowngrade(string direction) => $"capability-down:{direction}";
}
