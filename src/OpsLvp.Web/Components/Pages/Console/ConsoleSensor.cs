namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>A sensor the console can take out of or return to service.</summary>
public sealed record ConsoleSensor(string SensorId, bool OutOfService, string Label, string ButtonLabel, string CssClass);
