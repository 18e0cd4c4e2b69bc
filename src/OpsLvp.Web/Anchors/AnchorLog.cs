using System.Text;
using OpsLvp.Core.Audit.Anchors;

namespace OpsLvp.Web.Anchors;

/// <summary>The anchor log file: appended one JSON line at a time, flushed to disk (docs/audit.md "Anchors").</summary>
public sealed class AnchorLog(AnchorFiles files)
{
    private readonly Lock _lock = new();

    public string Path => files.LogPath;

    public void Append(AuditAnchor anchor)
    {
        ArgumentNullException.ThrowIfNull(anchor);
        var bytes = Encoding.UTF8.GetBytes(anchor.ToJsonLine() + "\n");
        lock (_lock)
        {
            Directory.CreateDirectory(System.IO.Path.GetDirectoryName(files.LogPath)!);
            using var file = new FileStream(files.LogPath, FileMode.Append, FileAccess.Write, FileShare.Read);
            file.Write(bytes);
            file.Flush(flushToDisk: true);
        }
    }

    /// <summary>All lines; none when the file does not exist yet.</summary>
    public IReadOnlyList<string> ReadLines()
    {
        lock (_lock)
        {
            return File.Exists(files.LogPath) ? File.ReadAllLines(files.LogPath) : [];
        }
    }
}
