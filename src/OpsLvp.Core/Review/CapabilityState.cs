namespace OpsLvp.Core.Review;

/// <summary>
/// What one runway direction supported from some instant on, as recorded (docs/capability.md "Review"): whether it
/// was in use, the best available approach category in words ("CAT II", "no CAT approach"), LVTO in words ("LVTO
/// available", "LVTO not available", empty when the direction offers none), and per operation not available its first
/// reason ("CAT III: TDZ lights 07L unserviceable (…)"), best operation first.
/// </summary>
public sealed record CapabilityState(string Direction, bool InUse, string Best, string Lvto, IReadOnlyList<string> NotAvailable)
{
    /// <summary>The headline in the same words as the wall and the events: "07L CAT II, LVTO available".</summary>
    public string Headline => $"{Direction} {Best}{(Lvto.Length > 0 ? ", " + Lvto : "")}";

    /// <summary>The first reason the direction is not better (the best operation not available), or empty.</summary>
    public string FirstReason => NotAvailable.Count > 0 ? NotAvailable[0] : "";

    /// <summary>Same headline, in-use flag and reasons.</summary>
    public bool SameAs(CapabilityState? other) =>
        other is not null && other.Direction == Direction && other.InUse == InUse && other.Best == Best && other.Lvto == Lvto
        && other.NotAvailable.SequenceEqual(NotAvailable, StringComparer.Ordinal);
}
