using OpsLvp.Core.Capability;
using OpsLvp.Core.Presentation;

namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>One runway direction on the wall's capability panel (docs/capability.md): words and class only, decided in Core.</summary>
/// <param name="Direction">Runway direction, e.g. "07L".</param>
/// <param name="InUse">Whether it is in use (shown first, marked "IN USE").</param>
/// <param name="Approach">Best available approach category, e.g. "CAT II", or "no CAT approach".</param>
/// <param name="Lvto">"LVTO available", "LVTO not available", or empty when not offered.</param>
/// <param name="Reason">The first reason something is not available, or empty.</param>
/// <param name="Observer">Whether an observer's RVR counts toward what is available (labelled "observer").</param>
/// <param name="CssClass">wall-cap-none when no approach category is available, else wall-cap-ok.</param>
public sealed record WallCapabilityRow(string Direction, bool InUse, string Approach, string Lvto, string Reason, bool Observer, string CssClass)
{
    /// <summary>The rows in the engine's order (directions in use first); empty without a capability section.</summary>
    public static IReadOnlyList<WallCapabilityRow> From(IReadOnlyList<RunwayCapability>? capability) =>
        capability is null
            ? []
            : capability.Select(c => new WallCapabilityRow(
                c.Direction,
                c.InUse,
                CapabilityWords.BestApproach(c.BestApproach),
                CapabilityWords.Lvto(c),
                CapabilityWords.FirstReason(c),
                c.Operations.Any(o => o.Available && o.UsesObserverRvr),
                c.BestApproach is null ? "wall-cap-none" : "wall-cap-ok")).ToList();
}
