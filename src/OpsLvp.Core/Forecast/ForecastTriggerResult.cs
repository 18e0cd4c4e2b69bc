namespace OpsLvp.Core.Forecast;

/// <summary>
/// The automatic forecast flag: <see cref="On"/> with its <see cref="Source"/> (null when off), and in words why
/// (<see cref="Reason"/>), for the state and the audit.
/// </summary>
public sealed record ForecastTriggerResult(bool On, ForecastTriggerSource? Source, string Reason);
