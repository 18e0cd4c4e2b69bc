using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Presentation;

/// <summary>
/// The words a dialog shows from a <see cref="CommandPreview"/> (docs/engine.md R40): whether the command moves the
/// state, and, for a cancel, the values it acts against beside the recovery thresholds and the engine's verdict.
/// State names come from <see cref="LvpVocabulary"/>, values and durations from <see cref="DisplayFormat"/>.
/// </summary>
public static class CommandPreviewWords
{
    /// <summary>
    /// "This will move the state to LVP preparation now (from Normal operations).", "This will move the state to
    /// LVP preparation within 30 s if the conditions hold (from Normal operations).", "This does not change the
    /// state: it stays LVP in force.", "This keeps Normal operations: without it the state would move to LVP
    /// preparation within 30 s.", or the engine's refusal.
    /// </summary>
    public static string Effect(CommandPreview preview)
    {
        ArgumentNullException.ThrowIfNull(preview);
        if (preview.Refusal is { } refusal)
        {
            return $"The engine would refuse this now: {refusal}.";
        }
        var before = LvpVocabulary.For(preview.Before);
        var after = LvpVocabulary.For(preview.After);
        if (before.State != after.State)
        {
            return $"This will move the state to {after.Name} now (from {before.Name}).";
        }
        var laterWith = LvpVocabulary.For(preview.LaterWith);
        var laterWithout = LvpVocabulary.For(preview.LaterWithout);
        if (laterWith.State != laterWithout.State && laterWith.State == after.State)
        {
            return $"This keeps {after.Name}: without it the state would move to {laterWithout.Name} within {DisplayFormat.Duration(preview.Dwell)}.";
        }
        if (laterWith.State != laterWithout.State)
        {
            return $"This will move the state to {laterWith.Name} within {DisplayFormat.Duration(preview.Dwell)} if the conditions hold (from {after.Name}).";
        }
        return $"This does not change the state: it stays {after.Name}.";
    }

    /// <summary>
    /// The second ask of a cancel the conditions do not support (docs/engine.md R15, R40), or null when they
    /// support it: "The conditions still call for LVP in force: the engine's recovery condition does not hold. …".
    /// </summary>
    public static string? SecondAsk(CommandPreview preview)
    {
        ArgumentNullException.ThrowIfNull(preview);
        if (!preview.AgainstConditions)
        {
            return null;
        }
        var before = LvpVocabulary.For(preview.Before);
        var forecast = preview.Before.DeteriorationForecast ? " and the deterioration forecast is on" : "";
        var back = LvpVocabulary.For(preview.LaterWith);
        var returns = back.State != LvpVocabulary.For(preview.After).State
            ? $" If they stay so, the engine returns to {back.Name} within {DisplayFormat.Duration(preview.Dwell)}."
            : "";
        return $"The conditions still call for {before.Name}: the recovery condition does not hold{forecast}.{returns} "
            + "Cancelling now is recorded as a relaxation against the conditions.";
    }

    /// <summary>
    /// The values a cancel acts against: RVR at every runway position with a sensor, the governing RVR, the ceiling
    /// when the aerodrome has ceilometers, then the thresholds the phase being left needs to recover.
    /// </summary>
    public static IReadOnlyList<PreviewFact> ConditionFacts(CommandPreview preview)
    {
        ArgumentNullException.ThrowIfNull(preview);
        var status = preview.Before;
        var facts = new List<PreviewFact>();
        foreach (var runway in status.Runways)
        {
            foreach (var p in runway.Positions.Where(p => p.SensorId is not null))
            {
                facts.Add(new PreviewFact($"RVR {runway.Direction} {p.Position.ToString().ToUpperInvariant()}", p switch
                {
                    { OutOfService: true } => "out of service",
                    { Reading: null } => "no data",
                    { Reading: { Stale: true } } => "stale",
                    { Reading: { } r } => DisplayFormat.Rvr(r.Value),
                }));
            }
        }
        facts.Add(new PreviewFact("Governing RVR", status.GoverningRvr is { } g ? $"{DisplayFormat.Rvr(g.Value)} at {g.Label}" : "unknown"));
        if (status.CeilingConfigured)
        {
            facts.Add(new PreviewFact("Ceiling", status.Ceiling is { } c ? DisplayFormat.Feet(c.Value) : "unknown"));
        }
        facts.Add(new PreviewFact("Deterioration forecast", status.DeteriorationForecast ? "on" : "off"));
        var leaving = LvpVocabulary.For(status).Name;
        if (preview.RecoveryRvrM is { } rvr)
        {
            facts.Add(new PreviewFact($"{leaving} recovers at RVR", $"{DisplayFormat.Metres(rvr)} or more"));
        }
        if (status.CeilingConfigured && preview.RecoveryCeilingFt is { } ceiling)
        {
            facts.Add(new PreviewFact($"{leaving} recovers at ceiling", $"{DisplayFormat.Feet(ceiling)} or more"));
        }
        return facts;
    }

    /// <summary>The engine's verdict on a cancel: whether the conditions support it (docs/engine.md R15).</summary>
    public static string CancelVerdict(CommandPreview preview)
    {
        ArgumentNullException.ThrowIfNull(preview);
        if (preview.Refusal is { } refusal)
        {
            return $"The engine would refuse this now: {refusal}.";
        }
        return preview.AgainstConditions
            ? $"Conditions still call for {LvpVocabulary.For(preview.Before).Name}."
            : "The conditions support cancelling: the recovery condition holds.";
    }
}
