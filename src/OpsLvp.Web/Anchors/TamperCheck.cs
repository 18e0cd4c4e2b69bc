using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Anchors;

/// <summary>
/// The engine host's start-up checks against the key and the anchor log (docs/audit.md "Anchors", "State seal"),
/// and which entry of an append carries the readings coverage ("Readings covered").
/// </summary>
public sealed class TamperCheck(AuditStore audit, AnchorKey key, AnchorLog log, AnchorService anchors, ILogger<TamperCheck> logger)
{
    /// <summary>How many of the newest anchors (after the last reset) the start compares; <c>opslvp audit verify --anchors</c> compares all.</summary>
    private const int AnchorsCompared = 64;

    /// <summary>
    /// Null when the stored state's seal verifies and no anchor in force is past the chain's head or disagrees with it;
    /// else the mismatch and the head sequence an administrator acknowledges it with.
    /// </summary>
    public async Task<(string Text, long Head)?> CheckAsync(PersistedEngineState? persisted, CancellationToken cancellationToken)
    {
        var head = (await audit.GetHeadAsync(cancellationToken))?.Sequence ?? 0;
        var (valid, problems) = AnchorCheck.Read(log.ReadLines(), key.Fingerprint);
        foreach (var p in problems)
        {
            logger.LogError("Anchor log {Path}: {Problem}", log.Path, p.Detail);
        }
        var start = 0;
        for (var i = 0; i < valid.Count; i++)
        {
            if (valid[i].Anchor.Reset)
            {
                start = i;
            }
        }
        var inForce = valid.Skip(Math.Max(start, valid.Count - AnchorsCompared)).ToList();
        var hashes = new Dictionary<long, string>();
        foreach (var s in inForce.Select(a => a.Anchor.Sequence).Where(s => s > 0 && s <= head).Distinct())
        {
            if ((await audit.GetRangeAsync(s, s, cancellationToken)).SingleOrDefault() is { } entry)
            {
                hashes[s] = entry.Hash;
            }
        }
        var anchorProblems = AnchorCheck.Compare(inForce, head, s => hashes.GetValueOrDefault(s));
        if (anchorProblems.Count > 0)
        {
            return ($"{anchorProblems[0].Detail} (anchor log {log.Path})", head);
        }
        if (persisted is null && head > 0 && await audit.GetLastOfKindAsync("engine_started", cancellationToken) is { } started)
        {
            // every start writes the state with its engine_started entry, so a chain with one and no state row lost it
            return ($"the engine state row is missing although the engine ran (engine_started at audit entry {started.Sequence})", head);
        }
        if (persisted is not null && !key.VerifySeal(persisted))
        {
            return (persisted.StateSignature is null
                ? $"the stored engine state (audit entry {persisted.AuditSequence}) carries no seal"
                : $"the stored engine state's seal does not verify with the anchor key {key.Fingerprint[..16]}…: its state, audit sequence {persisted.AuditSequence} or hash was edited (or the key was replaced)", head);
        }
        return null;
    }

    /// <summary>The last reading id an audit entry covers (0 when none does yet).</summary>
    public async Task<long> ReadingsCoveredToAsync(CancellationToken cancellationToken)
    {
        var last = await audit.GetLastContainingAsync($"\"{ReadingsCoverage.Member}\"", cancellationToken);
        return last is null ? 0 : ReadingsCoverage.From(last.PayloadJson)?.To ?? 0;
    }

    /// <summary>Writes the reset anchor after an acknowledged mismatch.</summary>
    public Task AnchorResetAsync(CancellationToken cancellationToken)
    {
        anchors.RequestReset();
        return anchors.AnchorNowAsync("state mismatch acknowledged", cancellationToken);
    }

    /// <summary>
    /// The entry of an append that carries the readings coverage: the first transition, else the first engine event
    /// (its payload opens with <c>"event"</c>), else <c>engine_started</c> or <c>readings_covered</c>; null when the append has none of these.
    /// </summary>
    public static int? CoveringIndex(IReadOnlyList<NewAuditEntry> entries)
    {
        ArgumentNullException.ThrowIfNull(entries);
        int? engineEvent = null;
        int? started = null;
        for (var i = 0; i < entries.Count; i++)
        {
            var e = entries[i];
            if (e.Kind == "transition")
            {
                return i;
            }
            if (engineEvent is null && e.PayloadJson.StartsWith("{\"event\":", StringComparison.Ordinal))
            {
                engineEvent = i;
            }
            if (started is null && (e.Kind is "engine_started" or OpsLvp.Web.Engine.AuditEvents.ReadingsCovered))
            {
                started = i;
            }
        }
        return engineEvent ?? started;
    }
}
