namespace OpsLvp.Core.Readings;

/// <summary>Why a reading did not reach the engine. Stored with the reading; codes are stable (used in logs and exports).</summary>
public enum RejectReason
{
    /// <summary>Could not be parsed (bad time, number, kind or status).</summary>
    Malformed,
    /// <summary>The sensor flagged the reading as not ok.</summary>
    StatusNotOk,
    /// <summary>The value lies outside the kind's physical range.</summary>
    OutOfRange,
    /// <summary>The reading's time lies in the future beyond the allowed clock skew.</summary>
    FutureDated,
    /// <summary>Same sensor, kind and time as a reading already taken.</summary>
    Duplicate,
    /// <summary>Older than the sensor's latest reading: stored, ignored for state (docs/engine.md R2).</summary>
    OlderThanLatest,
    /// <summary>The sensor is not in the aerodrome profile.</summary>
    UnknownSensor,
    /// <summary>The sensor exists but does not produce this kind.</summary>
    KindNotProduced,
}
