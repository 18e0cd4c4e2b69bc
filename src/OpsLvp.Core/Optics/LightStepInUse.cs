namespace OpsLvp.Core.Optics;

/// <summary>Where the runway-light step in use comes from (docs/engine.md R20).</summary>
public enum LightStepOrigin
{
    /// <summary>The profile's starting value <c>lights.stepInUse</c>.</summary>
    Profile,

    /// <summary>A <c>light_step</c> reading of a lighting sensor.</summary>
    Sensor,

    /// <summary>Set by hand by a duty manager.</summary>
    Manual,
}

/// <summary>
/// The runway-light step in use at an instant (docs/engine.md R20): <paramref name="Step"/> is null when unknown
/// (a lighting sensor went stale); <paramref name="Unknown"/> is true when the lowest configured intensity stands in.
/// </summary>
/// <param name="Step">The step (0 = lights off), or null when no step is known.</param>
/// <param name="Origin">Where it comes from.</param>
/// <param name="Source">The lighting sensor's id, or the duty manager who set it; null for the profile.</param>
/// <param name="Since">The reading's or the setting's time; null for the profile.</param>
/// <param name="Unknown">The step has no configured intensity (or none is known): the lowest configured intensity is used.</param>
public sealed record LightStepInUse(double? Step, LightStepOrigin Origin, string? Source, DateTimeOffset? Since, bool Unknown);
