using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>A reading did not reach the state (docs/engine.md R1, R2), with the stable reason code and a readable detail.</summary>
public sealed record ReadingRejected(DateTimeOffset At, Reading Reading, RejectReason Reason, string Detail) : EngineEvent(At);
