namespace OpsLvp.Core.Engine;

/// <summary>LVP phases (docs/engine.md). Severity order: Normal &lt; Preparation &lt; Active; Cancellation withdraws measures.</summary>
public enum Phase
{
    Normal,
    Preparation,
    Active,
    Cancellation,
}
