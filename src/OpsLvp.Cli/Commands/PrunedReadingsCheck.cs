using System.Globalization;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data;
using OpsLvp.Data.Retention;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// The pruned part of <c>opslvp audit verify</c> (docs/retention.md "Verification"): the ranges the chain's
/// <see cref="PrunedReadings.Kind"/> entries record are reported as pruned, not as edited readings; given the export
/// folder (<c>--exports DIR</c>) every named file is checked against its recorded SHA-256 and the covered windows that
/// reach into pruned ranges are recomputed from the exported readings (and the rows still in the table).
/// </summary>
internal sealed class PrunedReadingsCheck
{
    private readonly List<(long Sequence, PrunedReadings Run)> _runs;
    private readonly string? _exports;
    private readonly List<(ExportedReadingsFile File, string Path)> _files = [];
    private (string Name, List<ExportedReading> Readings)? _cached;

    private PrunedReadingsCheck(List<(long, PrunedReadings)> runs, string? exports)
    {
        _runs = runs;
        _exports = exports;
    }

    public IReadOnlyList<(long Sequence, PrunedReadings Run)> Runs => _runs;

    public bool HasExports => _exports is not null;

    public static async Task<PrunedReadingsCheck> LoadAsync(OpsLvpDbContext db, string? exports, List<AuditAnomaly> anomalies)
    {
        var rows = await db.AuditEntries.AsNoTracking().Where(e => e.Kind == PrunedReadings.Kind).OrderBy(e => e.Sequence)
            .Select(e => new { e.Sequence, e.PayloadJson }).ToListAsync();
        var runs = new List<(long, PrunedReadings)>();
        foreach (var row in rows)
        {
            if (PrunedReadings.From(row.PayloadJson) is { } run)
            {
                runs.Add((row.Sequence, run));
            }
            else
            {
                anomalies.Add(new AuditAnomaly("pruned_malformed", row.Sequence, null, Text($"entry {row.Sequence} ({PrunedReadings.Kind}) does not name a pruned range and its files")));
            }
        }
        var check = new PrunedReadingsCheck(runs, exports);
        if (exports is not null)
        {
            check.CheckFiles(anomalies);
        }
        return check;
    }

    public bool Overlaps(long after, long to) => _runs.Exists(r => r.Run.Overlaps(after, to));

    public bool IsPruned(long id) => _runs.Exists(r => r.Run.Holds(id));

    /// <summary>Count and digest of the window from the exported readings where pruned and the table elsewhere.</summary>
    public async Task<(long Count, string Sha256)> CoverAsync(OpsLvpDbContext db, long after, long to)
    {
        var kept = new List<ExportedReading>();
        await foreach (var row in db.Readings.AsNoTracking().Where(r => r.Id > after && r.Id <= to).OrderBy(r => r.Id).AsAsyncEnumerable())
        {
            if (!IsPruned(row.Id))
            {
                kept.Add(ExportedReading.From(row));
            }
        }
        using var digest = new ReadingsDigest();
        var k = 0;
        foreach (var exported in Exported(after, to))
        {
            while (k < kept.Count && kept[k].Id < exported.Id)
            {
                kept[k++].AddTo(digest);
            }
            exported.AddTo(digest);
        }
        while (k < kept.Count)
        {
            kept[k++].AddTo(digest);
        }
        return (digest.Count, digest.Finish());
    }

    private IEnumerable<ExportedReading> Exported(long after, long to)
    {
        foreach (var (file, path) in _files.Where(f => f.File.LastId > after && f.File.FirstId <= to).OrderBy(f => f.File.FirstId))
        {
            if (_cached is not { } c || c.Name != file.Name)
            {
                List<ExportedReading> readings;
                try
                {
                    readings = ReadingsExportFormat.Read(path).ToList();
                }
                catch (Exception ex) when (ex is InvalidDataException or IOException)
                {
                    readings = [];
                }
                _cached = (file.Name, readings);
            }
            foreach (var r in _cached.Value.Readings)
            {
                if (r.Id > after && r.Id <= to)
                {
                    yield return r;
                }
            }
        }
    }

    private void CheckFiles(List<AuditAnomaly> anomalies)
    {
        foreach (var (sequence, run) in _runs)
        {
            foreach (var file in run.Files)
            {
                var path = Path.Combine(_exports!, file.Name);
                if (file.Name.IndexOfAny(['/', '\\']) >= 0 || !File.Exists(path))
                {
                    anomalies.Add(new AuditAnomaly("export_missing", sequence, null, Text($"export file {file.Name} named by entry {sequence} is not in '{_exports}'")));
                    continue;
                }
                _files.Add((file, path));
                string sha;
                try
                {
                    sha = ReadingsExportFormat.FileSha256(path);
                    var (count, first, last, readingsSha) = ReadingsExportFormat.Digest(path);
                    if (sha == file.Sha256 && count == file.Count && first == file.FirstId && last == file.LastId && readingsSha == file.ReadingsSha256)
                    {
                        continue;
                    }
                }
                catch (Exception ex) when (ex is InvalidDataException or IOException)
                {
                    anomalies.Add(new AuditAnomaly("export_mismatch", sequence, null, Text($"export file {file.Name} named by entry {sequence} cannot be read back: {ex.Message}")));
                    continue;
                }
                anomalies.Add(new AuditAnomaly("export_mismatch", sequence, null,
                    Text($"export file {file.Name} does not match entry {sequence}: recorded SHA-256 {file.Sha256}, the file has {sha}: it was edited or replaced")));
            }
        }
    }

    private static string Text(FormattableString s) => s.ToString(CultureInfo.InvariantCulture);
}
