using System.Diagnostics;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>
/// A small tmpfs mounted on a fresh folder, for storage-fault tests (disk full, read-only): needs root and a kernel that
/// lets this process mount (<see cref="RootFactAttribute"/>). <see cref="Fill"/> takes every free byte with a filler
/// file; <see cref="Free"/> deletes it; <see cref="SetReadOnly"/> remounts a bind of the folder read-only, so files
/// already open stay writable through their descriptors but nothing new can be written (what an operator's
/// "read-only data folder" does to a running server).
/// </summary>
public sealed class SmallFilesystem : IDisposable
{
    private readonly string _filler;
    private bool _readOnlyBind;

    private SmallFilesystem(string root)
    {
        Root = root;
        _filler = Path.Combine(root, "filler.bin");
    }

    public string Root { get; }

    public static SmallFilesystem Mount(int megabytes)
    {
        var root = OpsLvpApp.NewDataFolder();
        Directory.CreateDirectory(root);
        Run("mount", "-t", "tmpfs", "-o", $"size={megabytes}m", "tmpfs", root);
        return new SmallFilesystem(root);
    }

    /// <summary>Writes a filler file until the filesystem is full; returns its length.</summary>
    public long Fill()
    {
        var chunk = new byte[64 * 1024];
        using var stream = new FileStream(_filler, FileMode.Append, FileAccess.Write, FileShare.ReadWrite, 1, FileOptions.None);
        var step = chunk.Length;
        while (step >= 512)
        {
            try
            {
                stream.Write(chunk, 0, step);
                stream.Flush();
            }
            catch (IOException)
            {
                step /= 2;
            }
        }
        return stream.Length;
    }

    public void Free() => File.Delete(_filler);

    public void SetReadOnly()
    {
        Run("mount", "--bind", Root, Root);
        _readOnlyBind = true;
        Run("mount", "-o", "remount,bind,ro", Root);
    }

    public void SetWritable()
    {
        if (_readOnlyBind)
        {
            Run("umount", Root);
            _readOnlyBind = false;
        }
    }

    public void Dispose()
    {
        SetWritable();
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        // lazy: a server being torn down may still hold a descriptor for a moment
        Run("umount", "-l", Root);
        OpsLvpApp.TryDelete(Root);
    }

    private static void Run(string file, params string[] args)
    {
        var start = new ProcessStartInfo(file) { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        foreach (var a in args)
        {
            start.ArgumentList.Add(a);
        }
        using var process = Process.Start(start)!;
        var error = process.StandardError.ReadToEnd();
        process.WaitForExit();
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"{file} {string.Join(' ', args)} failed ({process.ExitCode}): {error.Trim()}");
        }
    }
}
