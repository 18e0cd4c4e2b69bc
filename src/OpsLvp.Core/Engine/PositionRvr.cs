using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Engine;

/// <summary>The RVR at one position: <paramref name="SensorId"/> null when no sensor stands there, <paramref name="Reading"/> null when it never reported.</summary>
/// <param name="Governing">Whether the position is one of the profile's governing positions.</param>
/// <param name="OutOfService">Marked out of service by an operator.</param>
/// <param name="Position">TDZ, MID or END.</param>
/// <param name="SensorId">The sensor that gave the value.</param>
/// <param name="Reading">The latest reading there.</param>
public sealed record PositionRvr(RvrPosition Position, string? SensorId, MeasuredValue? Reading, bool OutOfService, bool Governing);
