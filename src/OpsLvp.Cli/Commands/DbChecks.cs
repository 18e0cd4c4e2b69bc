using System.Globalization;
using System.Security.Cryptography;
using System.Text.Json;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// What <c>opslvp audit verify --db</c> checks beyond the hash chain (docs/audit.md "Verification with anchors"):
/// the readings each entry covers, the engine state row against the chain (and its seal when a key is known), and
/// with an anchor log the anchors' signatures and the chain against them.
/// </summary>
internal sealed class DbChecks
{
    private readonly List<AuditAnomaly> _anomalies = [];

    public IReadOnlyList<AuditAnomaly> Anomalies => _anomalies;

    private int? _anchorLines;
    private int _anchorsValid;
    private long? _newestAnchored;
    private string? _anchorKey;
    private long _coveringEntries;
    private long _coveredTo;
    private long? _uncovered;
    private string _stateSeal = "not_checked";
    private PrunedReadingsCheck? _pruned;
    private long _prunedWindows;
    private long _prunedWindowsChecked;

    public static async Task<DbChecks> RunAsync(IDbContextFactory<OpsLvpDbContext> factory, AuditStore store, IReadOnlyList<string>? anchorLines, string? trustedFingerprint, string? exportsFolder = null)
    {
        var checks = new DbChecks();
        var head = (await store.GetHeadAsync())?.Sequence ?? 0;
        await using var db = await factory.CreateDbContextAsync();
        await checks.CheckReadingsAsync(factory, db, exportsFolder);
        string? publicKey = null;
        if (anchorLines is not null)
        {
            publicKey = await checks.CheckAnchorsAsync(db, anchorLines, trustedFingerprint, head);
        }
        await checks.CheckStateAsync(db, head, publicKey);
        return checks;
    }

    public void Write(Utf8JsonWriter json)
    {
        json.WriteStartArray("anomalies");
        foreach (var a in _anomalies)
        {
            json.WriteStartObject();
            json.WriteString("kind", a.Kind);
            WriteNullable(json, "sequence", a.Sequence);
            WriteNullable(json, "anchor_line", a.AnchorLine);
            json.WriteString("detail", a.Detail);
            json.WriteEndObject();
        }
        json.WriteEndArray();
        if (_anchorLines is { } lines)
        {
            json.WriteStartObject("anchors");
            json.WriteNumber("lines", lines);
            json.WriteNumber("valid", _anchorsValid);
            WriteNullable(json, "newest_sequence", _newestAnchored);
            json.WriteString("key", _anchorKey);
            json.WriteEndObject();
        }
        json.WriteStartObject("readings");
        json.WriteNumber("covering_entries", _coveringEntries);
        json.WriteNumber("covered_to_id", _coveredTo);
        WriteNullable(json, "uncovered", _uncovered);
        if (_pruned is { Runs.Count: > 0 } pruned)
        {
            // docs/retention.md "Verification": pruned ranges are reported as pruned, not as edited readings
            json.WriteStartObject("pruned");
            json.WriteNumber("runs", pruned.Runs.Count);
            json.WriteNumber("readings", pruned.Runs.Sum(r => r.Run.Count));
            json.WriteStartArray("ranges");
            foreach (var (sequence, run) in pruned.Runs)
            {
                json.WriteStartObject();
                json.WriteNumber("sequence", sequence);
                json.WriteNumber("after", run.After);
                json.WriteNumber("to", run.To);
                json.WriteNumber("count", run.Count);
                json.WriteNumber("files", run.Files.Count);
                json.WriteEndObject();
            }
            json.WriteEndArray();
            json.WriteNumber("windows", _prunedWindows);
            json.WriteNumber("windows_checked_against_exports", _prunedWindowsChecked);
            json.WriteBoolean("exports_given", pruned.HasExports);
            json.WriteEndObject();
        }
        json.WriteEndObject();
        json.WriteString("state_seal", _stateSeal);
    }

    private async Task CheckReadingsAsync(IDbContextFactory<OpsLvpDbContext> factory, OpsLvpDbContext db, string? exportsFolder)
    {
        if (!await TableExistsAsync(db, "readings"))
        {
            return;
        }
        var pruned = _pruned = await PrunedReadingsCheck.LoadAsync(db, exportsFolder, _anomalies);
        var marker = $"\"{ReadingsCoverage.Member}\"";
        var covering = await db.AuditEntries.AsNoTracking().Where(e => e.PayloadJson.Contains(marker)).OrderBy(e => e.Sequence)
            .Select(e => new { e.Sequence, e.Kind, e.PayloadJson }).ToListAsync();
        using var readings = new ReadingStore(factory);
        foreach (var entry in covering)
        {
            if (ReadingsCoverage.From(entry.PayloadJson) is not { } claimed)
            {
                continue;
            }
            _coveringEntries++;
            if (claimed.After != _coveredTo)
            {
                _anomalies.Add(new AuditAnomaly("readings_window_gap", entry.Sequence, null,
                    Text($"entry {entry.Sequence} ({entry.Kind}) covers readings after id {claimed.After}, but the covering entry before it ended at id {_coveredTo}")));
            }
            if (pruned.Overlaps(claimed.After, claimed.To))
            {
                _prunedWindows++;
                if (pruned.HasExports)
                {
                    _prunedWindowsChecked++;
                    var (count, sha) = await pruned.CoverAsync(db, claimed.After, claimed.To);
                    if (count != claimed.Count || !string.Equals(sha, claimed.Sha256, StringComparison.Ordinal))
                    {
                        _anomalies.Add(new AuditAnomaly("readings_mismatch", entry.Sequence, null,
                            Text($"entry {entry.Sequence} ({entry.Kind}) covers readings with id {claimed.After + 1}–{claimed.To}, partly pruned: it recorded {claimed.Count} reading(s), the export files and the table hold {count}{(count == claimed.Count ? " with other content" : "")}: an exported or stored reading in that window was edited, deleted or added")));
                    }
                }
                _coveredTo = Math.Max(_coveredTo, claimed.To);
                continue;
            }
            var found = await readings.CoverAsync(claimed.After, claimed.To);
            if (found.Count != claimed.Count || !string.Equals(found.Sha256, claimed.Sha256, StringComparison.Ordinal))
            {
                _anomalies.Add(new AuditAnomaly("readings_mismatch", entry.Sequence, null,
                    Text($"entry {entry.Sequence} ({entry.Kind}) covers readings with id {claimed.After + 1}–{claimed.To}: it recorded {claimed.Count} reading(s), the table holds {found.Count}{(found.Count == claimed.Count ? " with other content" : "")}: a reading in that window was edited, deleted or added")));
            }
            _coveredTo = Math.Max(_coveredTo, claimed.To);
        }
        var after = _coveredTo;
        _uncovered = await db.Readings.AsNoTracking().LongCountAsync(r => r.Id > after);
    }

    private async Task<string?> CheckAnchorsAsync(OpsLvpDbContext db, IReadOnlyList<string> lines, string? trustedFingerprint, long head)
    {
        var (valid, problems) = AnchorCheck.Read(lines, trustedFingerprint);
        _anchorLines = lines.Count;
        _anchorsValid = valid.Count;
        _anomalies.AddRange(problems);
        var sequences = valid.Select(v => v.Anchor.Sequence).Where(s => s > 0 && s <= head).Distinct().ToList();
        var hashes = new Dictionary<long, string>();
        foreach (var chunk in sequences.Chunk(500))
        {
            foreach (var row in await db.AuditEntries.AsNoTracking().Where(e => chunk.Contains(e.Sequence)).Select(e => new { e.Sequence, e.Hash }).ToListAsync())
            {
                hashes[row.Sequence] = row.Hash;
            }
        }
        _anomalies.AddRange(AnchorCheck.Compare(valid, head, s => hashes.GetValueOrDefault(s)));
        _newestAnchored = valid.Count == 0 ? null : valid.Max(v => v.Anchor.Sequence);
        var key = valid.Count == 0 ? null : valid[^1].Anchor.PublicKey;
        _anchorKey = key is null ? trustedFingerprint : AuditAnchor.Fingerprint(key);
        return key;
    }

    private async Task CheckStateAsync(OpsLvpDbContext db, long head, string? publicKey)
    {
        if (!await TableExistsAsync(db, "engine_state"))
        {
            return;
        }
        var row = await db.EngineState.AsNoTracking().SingleOrDefaultAsync(s => s.Id == EngineStateRow.SingleId);
        if (row is null)
        {
            _stateSeal = "no_state";
            if (await db.AuditEntries.AsNoTracking().Where(e => e.Kind == "engine_started").OrderByDescending(e => e.Sequence).Select(e => (long?)e.Sequence).FirstOrDefaultAsync() is { } started)
            {
                _anomalies.Add(new AuditAnomaly("state_mismatch", started, null,
                    Text($"the engine state row is missing although the engine ran (engine_started at audit entry {started})")));
            }
            return;
        }
        if (row.AuditSequence > head)
        {
            _anomalies.Add(new AuditAnomaly("state_mismatch", row.AuditSequence, null,
                Text($"the engine state reflects audit entry {row.AuditSequence} but the chain ends at {head}: entries were removed")));
        }
        else if (row.AuditHash is { } hash && row.AuditSequence > 0)
        {
            var stored = await db.AuditEntries.AsNoTracking().Where(e => e.Sequence == row.AuditSequence).Select(e => e.Hash).SingleOrDefaultAsync();
            if (!string.Equals(stored, hash, StringComparison.Ordinal))
            {
                _anomalies.Add(new AuditAnomaly("state_mismatch", row.AuditSequence, null,
                    Text($"audit entry {row.AuditSequence} does not have the hash the engine state recorded for it: the chain was rewritten")));
            }
        }
        if (publicKey is null)
        {
            return;
        }
        using var key = ECDsa.Create();
        key.ImportSubjectPublicKeyInfo(Convert.FromBase64String(publicKey), out _);
        if (StateSeal.Verify(key, row.StateSignature, row.AuditSequence, row.AuditHash, row.StateJson, row.ProfileVersion))
        {
            _stateSeal = "ok";
            return;
        }
        _stateSeal = row.StateSignature is null ? "missing" : "invalid";
        _anomalies.Add(new AuditAnomaly("state_mismatch", row.AuditSequence, null, row.StateSignature is null
            ? Text($"the engine state (audit entry {row.AuditSequence}) carries no seal")
            : Text($"the engine state's seal does not verify with the anchor key: its state JSON, audit sequence {row.AuditSequence} or hash was edited")));
    }

    internal static async Task<bool> TableExistsAsync(OpsLvpDbContext db, string name) =>
        (db.Database.ProviderName ?? "").Contains("Npgsql", StringComparison.Ordinal)
            ? await db.Database.SqlQuery<long>($"SELECT count(*) AS \"Value\" FROM information_schema.tables WHERE table_schema = current_schema() AND table_name = {name}").SingleAsync() > 0
            : await db.Database.SqlQuery<long>($"SELECT count(*) AS \"Value\" FROM sqlite_master WHERE type = 'table' AND name = {name}").SingleAsync() > 0;

    private static string Text(FormattableString s) => s.ToString(CultureInfo.InvariantCulture);

    private static void WriteNullable(Utf8JsonWriter json, string name, long? value)
    {
        if (value is { } v)
        {
            json.WriteNumber(name, v);
        }
        else
        {
            json.WriteNull(name);
        }
    }
}
