using System.IO.Compression;
using System.Text.Json;
using System.Text.Encodings.Web;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data.Stores;

namespace OpsLvp.Data.Retention;

/// <summary>
/// Prunes raw readings on either provider (docs/retention.md): exports the readings it is about to delete to gzip
/// NDJSON files (one per receipt day) in the export folder, flushes them to disk, reads each back and checks its count,
/// content digest and file SHA-256, appends ONE <see cref="PrunedReadings.Kind"/> audit entry naming the id range, the
/// count and every file's digests, and only then deletes the rows in bounded batches. Any failure before the audit
/// entry deletes nothing (and removes this run's files). Only readings the chain already covers are pruned (id ≤ the
/// newest <c>readingsCovered.to</c>), so the engine's next covering window is never touched. The entry carries the
/// request's leadership epoch (docs/engine.md R71): on PostgreSQL a run whose node no longer leads records and deletes nothing.
/// </summary>
public sealed class ReadingsPruner(IDbContextFactory<OpsLvpDbContext> factory, AuditStore audit, TimeProvider time)
{
    private static readonly JsonWriterOptions s_json = new() { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping, SkipValidation = false };

    /// <summary>The id up to which readings are covered by the chain (0 when none are).</summary>
    public async Task<long> CoveredToAsync(CancellationToken cancellationToken = default)
    {
        var entry = await audit.GetLastContainingAsync($"\"{ReadingsCoverage.Member}\"", cancellationToken);
        return entry is null ? 0 : ReadingsCoverage.From(entry.PayloadJson)?.To ?? 0;
    }

    /// <summary>The newest pruning run the chain records, or null.</summary>
    public async Task<PrunedReadings?> LastPrunedAsync(CancellationToken cancellationToken = default)
    {
        var entry = await audit.GetLastOfKindAsync(PrunedReadings.Kind, cancellationToken);
        return entry is null ? null : PrunedReadings.From(entry.PayloadJson);
    }

    public async Task<PruneOutcome> RunAsync(PruneRequest request, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentOutOfRangeException.ThrowIfLessThan(request.BatchSize, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(request.MaxReadings, 1);

        // 1. rows an earlier run exported and recorded but did not finish deleting
        var last = await LastPrunedAsync(cancellationToken);
        var after = last?.To ?? 0;
        long leftovers = 0;
        try
        {
            leftovers = await DeleteAsync(0, after, request.BatchSize, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            return new PruneOutcome(null, null, 0, $"readings already exported and recorded up to id {after} could not be deleted: {Message(ex)}");
        }

        // 2. export what is due: covered by the chain, received before the cutoff, in id order, stopping at the first newer one
        var coveredTo = await CoveredToAsync(cancellationToken);
        var folder = Path.GetFullPath(request.ExportFolder);
        var written = new List<(string Path, ExportedReadingsFile File)>();
        FileBuilder? current = null;
        try
        {
            Directory.CreateDirectory(folder);
            await using (var db = await factory.CreateDbContextAsync(cancellationToken))
            {
                var rows = db.Readings.AsNoTracking().Where(r => r.Id > after && r.Id <= coveredTo).OrderBy(r => r.Id).Take(request.MaxReadings).AsAsyncEnumerable();
                await foreach (var row in rows.WithCancellation(cancellationToken))
                {
                    if (row.ReceivedAt >= request.Cutoff)
                    {
                        break;
                    }
                    var day = DateOnly.FromDateTime(row.ReceivedAt.UtcDateTime);
                    if (current is null || current.Day != day)
                    {
                        if (current is not null)
                        {
                            written.Add(current.Finish(folder));
                        }
                        current = new FileBuilder(folder, day);
                    }
                    current.Add(ExportedReading.From(row));
                }
            }
            if (current is not null)
            {
                written.Add(current.Finish(folder));
                current = null;
            }
            if (written.Count == 0)
            {
                return new PruneOutcome(null, null, leftovers, null);
            }
            // 3. read every file back from disk: bytes, count and content must be what was written
            foreach (var (path, file) in written)
            {
                var sha = ReadingsExportFormat.FileSha256(path);
                var (count, first, lastId, readingsSha) = ReadingsExportFormat.Digest(path);
                if (sha != file.Sha256 || count != file.Count || first != file.FirstId || lastId != file.LastId || readingsSha != file.ReadingsSha256)
                {
                    throw new IOException($"export file {file.Name} did not read back as written ({count} of {file.Count} readings)");
                }
                await File.WriteAllTextAsync(path[..^ReadingsExportFormat.Extension.Length] + ReadingsExportFormat.Extension + ".sha256", $"{sha}  {file.Name}\n", cancellationToken);
            }
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            current?.Abandon();
            Remove(written);
            return new PruneOutcome(null, null, leftovers, $"readings not pruned: the export to '{folder}' failed: {Message(ex)}");
        }
        catch (OperationCanceledException)
        {
            current?.Abandon();
            Remove(written);
            throw;
        }

        // 4. one audit entry for the run; without it nothing is deleted
        var files = written.ConvertAll(w => w.File);
        var pruned = new PrunedReadings(after, files[^1].LastId, files.Sum(f => f.Count), request.Cutoff, files);
        long sequence;
        try
        {
            var committed = await audit.AppendFencedAsync([new NewAuditEntry(PrunedReadings.Actor, PrunedReadings.Kind, pruned.ToPayloadJson(), time.GetUtcNow())], null, request.Epoch, cancellationToken);
            sequence = committed[^1].Sequence;
        }
        catch (Exception ex) when (ex is AuditCommitException or ArgumentException or StaleEpochException)
        {
            Remove(written);
            return new PruneOutcome(null, null, leftovers, $"readings not pruned: the audit entry was not committed: {Message(ex)}");
        }

        // 5. delete in bounded batches; what is left is deleted by the next run (step 1)
        try
        {
            await DeleteAsync(pruned.After, pruned.To, request.BatchSize, cancellationToken);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            return new PruneOutcome(pruned, sequence, leftovers, $"readings {pruned.After + 1}–{pruned.To} were exported and recorded (audit entry {sequence}) but not all deleted; the next run deletes the rest: {Message(ex)}");
        }
        return new PruneOutcome(pruned, sequence, leftovers, null);
    }

    private async Task<long> DeleteAsync(long after, long to, int batch, CancellationToken cancellationToken)
    {
        if (to <= after)
        {
            return 0;
        }
        await using var db = await factory.CreateDbContextAsync(cancellationToken);
        var first = await db.Readings.Where(r => r.Id > after && r.Id <= to).MinAsync(r => (long?)r.Id, cancellationToken);
        if (first is null)
        {
            return 0;
        }
        long deleted = 0;
        for (var from = first.Value - 1; from < to; from = Math.Min(to, from + batch))
        {
            var upTo = Math.Min(to, from + batch);
            var lower = from;
            deleted += await db.Readings.Where(r => r.Id > lower && r.Id <= upTo).ExecuteDeleteAsync(cancellationToken);
        }
        return deleted;
    }

    private static void Remove(List<(string Path, ExportedReadingsFile File)> written)
    {
        foreach (var (path, _) in written)
        {
            TryDelete(path);
            TryDelete(path + ".sha256");
        }
    }

    private static void TryDelete(string path)
    {
        try
        {
            File.Delete(path);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // best effort: an unrecorded file is not named by any audit entry
        }
    }

    private static string Message(Exception ex) => (ex.InnerException ?? ex).Message.ReplaceLineEndings(" ");

    /// <summary>One export file being written: gzip NDJSON to a temporary name, flushed to disk, renamed when finished.</summary>
    private sealed class FileBuilder
    {
        private readonly string _temp;
        private readonly FileStream _file;
        private readonly GZipStream _gzip;
        private readonly Utf8JsonWriter _json;
        private readonly ReadingsDigest _digest = new();
        private long _first;

        public FileBuilder(string folder, DateOnly day)
        {
            Day = day;
            _temp = Path.Combine(folder, $".readings-{Guid.NewGuid():N}.tmp");
            _file = new FileStream(_temp, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16);
            _gzip = new GZipStream(_file, CompressionLevel.Optimal, leaveOpen: true);
            _json = new Utf8JsonWriter(_gzip, s_json);
            ReadingsExportFormat.WriteHeader(_json, day);
            NewLine();
        }

        public DateOnly Day { get; }

        public void Add(ExportedReading reading)
        {
            if (_digest.Count == 0)
            {
                _first = reading.Id;
            }
            reading.AddTo(_digest);
            ReadingsExportFormat.Write(_json, reading);
            NewLine();
        }

        public (string Path, ExportedReadingsFile File) Finish(string folder)
        {
            var count = _digest.Count;
            var lastId = _digest.LastId;
            var readingsSha = _digest.Finish();
            _json.Dispose();
            _gzip.Dispose();
            _file.Flush(flushToDisk: true);
            _file.Dispose();
            _digest.Dispose();
            var name = ReadingsExportFormat.FileName(Day, _first, lastId);
            var path = Path.Combine(folder, name);
            File.Move(_temp, path, overwrite: true);
            return (path, new ExportedReadingsFile(name, count, _first, lastId, ReadingsExportFormat.FileSha256(path), readingsSha));
        }

        public void Abandon()
        {
            try
            {
                _json.Dispose();
                _gzip.Dispose();
                _file.Dispose();
            }
            catch (Exception ex) when (ex is IOException or ObjectDisposedException)
            {
                // the file is removed below
            }
            _digest.Dispose();
            TryDelete(_temp);
        }

        private void NewLine()
        {
            _json.Flush();
            _json.Reset();
            _gzip.WriteByte((byte)'\n');
        }
    }
}
