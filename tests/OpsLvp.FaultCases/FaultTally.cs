using System.Collections.Concurrent;
using System.Globalization;
using System.Text;

namespace OpsLvp.FaultCases;

/// <summary>
/// Counts per fault case: how many were tried, held (the answer or outcome was correct) and broke, with the first few
/// breaks kept as examples, and cases that could not run with the reason. Thread-safe.
/// </summary>
public sealed class FaultTally
{
    private const int ExamplesKept = 5;

    private readonly ConcurrentDictionary<string, Row> _rows = new(StringComparer.Ordinal);

    private readonly ConcurrentDictionary<string, string> _skipped = new(StringComparer.Ordinal);

    private readonly ConcurrentDictionary<string, string> _notes = new(StringComparer.Ordinal);

    public void Held(string group, string name) => Get(group, name).AddHeld();

    public void Broke(string group, string name, string why) => Get(group, name).AddBroke(why);

    public void Skipped(string group, string name, string why) => _skipped[group + "\t" + name] = (why ?? "").ReplaceLineEndings(" ");

    /// <summary>A figure printed under the table, e.g. "acknowledged readings checked after restarts: 12 345".</summary>
    public void Note(string key, string text) => _notes[key] = text;

    public long Tried => _rows.Values.Sum(r => r.Tried);

    public long Broken => _rows.Values.Sum(r => r.BrokeCount);

    public long TriedIn(string group) => _rows.Where(p => p.Key.StartsWith(group + "\t", StringComparison.Ordinal)).Sum(p => p.Value.Tried);

    public long BrokeIn(string group) => _rows.Where(p => p.Key.StartsWith(group + "\t", StringComparison.Ordinal)).Sum(p => p.Value.BrokeCount);

    public IEnumerable<string> Examples => _rows.OrderBy(p => p.Key, StringComparer.Ordinal).SelectMany(p => p.Value.Examples.Select(e => $"{p.Key.Replace('\t', '/')}: {e}"));

    /// <summary>The table as markdown: group, case, tried, held, broke; skipped cases with their reason; notes; examples of breaks.</summary>
    public string ToMarkdown()
    {
        var text = new StringBuilder();
        text.AppendLine("| group | case | tried | held | broke |");
        text.AppendLine("|---|---|---:|---:|---:|");
        foreach (var (key, row) in _rows.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            var parts = key.Split('\t');
            text.AppendLine(CultureInfo.InvariantCulture, $"| {parts[0]} | {parts[1]} | {row.Tried:N0} | {row.HeldCount:N0} | {row.BrokeCount:N0} |");
        }
        foreach (var (key, why) in _skipped.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            var parts = key.Split('\t');
            text.AppendLine(CultureInfo.InvariantCulture, $"| {parts[0]} | {parts[1]} | skipped: {why} | | |");
        }
        text.AppendLine(CultureInfo.InvariantCulture, $"| **all** | | **{Tried:N0}** | **{Tried - Broken:N0}** | **{Broken:N0}** |");
        foreach (var note in _notes.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            text.AppendLine();
            text.Append("- ").Append(note.Value);
        }
        if (_notes.IsEmpty)
        {
            return AppendExamples(text).ToString();
        }
        text.AppendLine();
        return AppendExamples(text).ToString();
    }

    private StringBuilder AppendExamples(StringBuilder text)
    {
        var examples = Examples.ToList();
        if (examples.Count > 0)
        {
            text.AppendLine();
            text.AppendLine("Breaks (first few per case):");
            foreach (var e in examples)
            {
                text.Append("- ").AppendLine(e);
            }
        }
        return text;
    }

    private Row Get(string group, string name) => _rows.GetOrAdd(group + "\t" + name, _ => new Row());

    private sealed class Row
    {
        private long _held;
        private long _broke;
        private readonly ConcurrentQueue<string> _examples = new();

        public long HeldCount => Interlocked.Read(ref _held);

        public long BrokeCount => Interlocked.Read(ref _broke);

        public long Tried => HeldCount + BrokeCount;

        public IEnumerable<string> Examples => _examples;

        public void AddHeld() => Interlocked.Increment(ref _held);

        public void AddBroke(string why)
        {
            if (Interlocked.Increment(ref _broke) <= ExamplesKept)
            {
                _examples.Enqueue(why);
            }
        }
    }
}
