namespace OpsLvp.Core.Capability;

/// <summary>An operation a runway direction may offer: an approach category or low-visibility take-off (docs/capability.md).</summary>
public enum OperationKind
{
    CatI,
    CatII,
    CatIII,
    /// <summary>Low-visibility take-off.</summary>
    Lvto,
}
