using System.Diagnostics;

namespace OpsLvp.FaultCases;

/// <summary>
/// A small tmpfs on a fresh folder for storage faults (needs root and a kernel that lets this process mount), used by
/// the fault runner and by the Web tests' disk-full and read-only tests:
/// <see cref="Fill"/> takes every free byte, <see cref="Free"/> gives it back, <see cref="SetReadOnly"/> puts a read-only
/// bind mount over the folder (files already open stay writable through their descriptors),
/// <see cref="TryRemountReadOnly"/> asks the kernel to make the tmpfs itself read-only.
/// </summary>
public sealed class SmallMount : IDisposable
{
    private readonly string _filler;

    private bool _readOnlyBind;

    private SmallMount(string root)
    {
        Root = root;
        _filler = Path.Combine(root, "filler.bin");
    }

    public string Root { get; }

    /// <summary>Null when this process can mount (root on Linux), else why not.</summary>
    public static string? CannotMount() =>
        !OperatingSystem.IsLinux() ? "not Linux" : !Environment.IsPrivilegedProcess ? "needs root to mount a small tmpfs" : null;

    public static SmallMount Mount(string root, int megabytes)
    {
        Directory.CreateDirectory(root);
        Run("mount", "-t", "tmpfs", "-o", $"size={megabytes}m", "tmpfs", root);
        return new SmallMount(root);
    }

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

    /// <summary><c>mount -o remount,ro</c> of the tmpfs itself: null when it worked, else the kernel's answer.</summary>
    public string? TryRemountReadOnly()
    {
        try
        {
            Run("mount", "-o", "remount,ro", Root);
            return null;
        }
        catch (InvalidOperationException ex)
        {
            return ex.Message;
        }
    }

    public void RemountWritable() => Run("mount", "-o", "remount,rw", Root);

    public void Dispose()
    {
        SetWritable();
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        // lazy: a server being torn down may still hold a descriptor for a moment
        Run("umount", "-l", Root);
        // a server on this folder keeps its anchor key and log beside it by default (docs/audit.md "Anchors")
        TryDelete(Path.TrimEndingDirectorySeparator(Root) + "-anchors");
        TryDelete(Root);
    }

    private static void TryDelete(string folder)
    {
        try
        {
            if (Directory.Exists(folder))
            {
                Directory.Delete(folder, recursive: true);
            }
        }
        catch (IOException)
        {
        }
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
