namespace OpsLvp.Core.Engine;

/// <summary>Release a declared hold (docs/engine.md R9); automatic relaxation may follow at once if its dwell has held.</summary>
public sealed record ReleaseHold(string Actor, string Reason) : EngineCommand(Actor);
