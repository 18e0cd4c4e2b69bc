namespace OpsLvp.Core.Engine;

/// <summary>
/// A person's action (docs/engine.md R9–R11). The engine checks that it can apply (and that a reason is given where
/// R9 asks for one) and otherwise emits <see cref="CommandRefused"/>; whether the actor may do it (roles) is
/// decided by the host before the command reaches the engine.
/// </summary>
public abstract record EngineCommand(string Actor) : EngineInput;
