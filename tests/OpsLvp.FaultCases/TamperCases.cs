using System.Globalization;
using System.Security.Cryptography;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Audit.Anchors;

namespace OpsLvp.FaultCases;

/// <summary>
/// The tamper case list, in one place for <c>TamperTests</c> in <c>dotnet test</c> and the fault runner's <c>--tamper</c>
/// (docs/reliability.md "Tamper evidence"). Each case is applied to a folder a real server recorded, after it stopped.
/// A case that finds nothing to change throws, so a run never counts a tampering that did not happen.
/// </summary>
public static class TamperCases
{
    public static IReadOnlyList<TamperCase> All { get; } =
    [
        new("ordinary_restart", "nothing: the server is started and stopped once more on the same folder",
            f => f.StartAndStopAsync(),
            null, null),
        new("delete_last_entries", "the append-only trigger dropped, the last 3 audit entries and the engine state row deleted",
            f => f.SqlAsync("DROP TRIGGER audit_entries_no_delete; DELETE FROM audit_entries WHERE sequence > (SELECT MAX(sequence) - 3 FROM audit_entries); DELETE FROM engine_state;"),
            "truncated", "were removed"),
        new("rewrite_before_anchor", "entry 2's payload changed and every hash after it recomputed (the chain verifies on its own), the state row deleted",
            RewriteEntryTwoAsync,
            "rewritten", "the chain was rewritten"),
        new("edited_state_json", "engine_state.state_json edited (LVP in force → normal), its sequence and hash untouched",
            async f =>
            {
                var changed = await f.SqlAsync("UPDATE engine_state SET state_json = replace(state_json, '\"Phase\":\"Active\"', '\"Phase\":\"Normal\"'); SELECT changes();");
                Expect(1L, changed, "state rows changed");
                Expect(0L, await f.SqlAsync("SELECT instr(state_json, '\"Phase\":\"Active\"') FROM engine_state;"), "LVP in force left in the state row");
            },
            "state_mismatch", "seal does not verify"),
        new("deleted_state_row", "the engine_state row deleted (the engine would start afresh from NORMAL)",
            f => f.SqlAsync("DELETE FROM engine_state;"),
            "state_mismatch", "the engine state row is missing"),
        new("forged_anchor", "a line added to the anchor log claiming a later head, its signature copied from the last real line",
            async f =>
            {
                var last = AuditAnchor.Parse((await File.ReadAllLinesAsync(f.AnchorLog)).Last(l => l.Length > 0));
                var forged = last with { Sequence = last.Sequence + 50 };
                await File.AppendAllTextAsync(f.AnchorLog, forged.ToJsonLine() + "\n");
            },
            "anchor_signature_invalid", null),
        new("anchor_other_key", "a line added to the anchor log signed by another key, claiming a later head",
            async f =>
            {
                using var other = ECDsa.Create(ECCurve.NamedCurves.nistP256);
                var last = AuditAnchor.Parse((await File.ReadAllLinesAsync(f.AnchorLog)).Last(l => l.Length > 0));
                var forged = AuditAnchor.Sign(other, last.Sequence + 50, last.Hash, last.Time.AddSeconds(1), reset: false);
                await File.AppendAllTextAsync(f.AnchorLog, forged.ToJsonLine() + "\n");
            },
            "anchor_wrong_key", null),
        new("edited_reading", "the RVR 400 m reading that drove LVP in force rewritten to 1400 m in the readings table",
            async f => Expect(1L, await f.SqlAsync($"UPDATE readings SET value = 1400 WHERE id = (SELECT MIN(id) FROM readings WHERE sensor = '{f.TdzSensor}' AND value = 400); SELECT changes();"), "readings changed"),
            "readings_mismatch", null),
        new("deleted_reading", "the RVR 900 m reading that drove preparation deleted from the readings table",
            async f => Expect(1L, await f.SqlAsync($"DELETE FROM readings WHERE id = (SELECT MIN(id) FROM readings WHERE sensor = '{f.TdzSensor}' AND value = 900); SELECT changes();"), "readings deleted"),
            "readings_mismatch", null),
    ];

    public static TamperCase Named(string name) => All.Single(c => c.Name == name);

    private static void Expect(long expected, object? actual, string what)
    {
        if (!Equals(actual, expected))
        {
            throw new InvalidOperationException($"tampering did not take: {what}: {actual ?? "null"}, expected {expected}");
        }
    }

    /// <summary>Rewrites entry 2 and re-chains everything after it, as someone who knows the hash rule would.</summary>
    private static async Task RewriteEntryTwoAsync(ITamperTarget f)
    {
        await using var connection = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={f.Database};Pooling=False");
        await connection.OpenAsync();
        var rows = new List<(long Sequence, string Time, string Actor, string Kind, string Payload)>();
        await using (var read = connection.CreateCommand())
        {
            read.CommandText = "SELECT sequence, time, actor, kind, payload_json FROM audit_entries ORDER BY sequence;";
            await using var reader = await read.ExecuteReaderAsync();
            while (await reader.ReadAsync())
            {
                rows.Add((reader.GetInt64(0), reader.GetString(1), reader.GetString(2), reader.GetString(3), reader.GetString(4)));
            }
        }
        await using var tx = connection.BeginTransaction();
        await using (var drop = connection.CreateCommand())
        {
            drop.Transaction = tx;
            drop.CommandText = "DROP TRIGGER audit_entries_no_update; DELETE FROM engine_state;";
            await drop.ExecuteNonQueryAsync();
        }
        AuditEntry? previous = null;
        foreach (var row in rows)
        {
            var payload = row.Sequence == 2 ? "{\"rewritten\":true}" : row.Payload;
            var time = DateTimeOffset.ParseExact(row.Time, AuditCanonical.TimeFormat, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal);
            var entry = AuditChain.Append(previous, time, row.Actor, row.Kind, payload);
            Expect(row.Sequence, entry.Sequence, "re-chained sequence");
            if (row.Sequence >= 2)
            {
                await using var update = connection.CreateCommand();
                update.Transaction = tx;
                update.CommandText = "UPDATE audit_entries SET payload_json = $p, previous_hash = $ph, hash = $h WHERE sequence = $s;";
                update.Parameters.AddWithValue("$p", payload);
                update.Parameters.AddWithValue("$ph", entry.PreviousHash);
                update.Parameters.AddWithValue("$h", entry.Hash);
                update.Parameters.AddWithValue("$s", row.Sequence);
                Expect(1L, (long)await update.ExecuteNonQueryAsync(), "entries rewritten");
            }
            previous = entry;
        }
        await tx.CommitAsync();
    }
}
