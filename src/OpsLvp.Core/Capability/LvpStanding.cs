namespace OpsLvp.Core.Capability;

/// <summary>Whether LVP are in force, as operations that need LVP see it (docs/engine.md R13).</summary>
public enum LvpStanding
{
    NotInForce,
    /// <summary>The conditions are met (or active was declared over open items) but safeguards are incomplete.</summary>
    SafeguardsIncomplete,
    InForce,
}
