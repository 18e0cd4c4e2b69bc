using System.Diagnostics;
using System.Runtime.InteropServices;

namespace OpsLvp.FaultCases;

/// <summary>
/// A small ext4 filesystem in an image file on a loop device (needs root and loop devices), which can be shut down
/// under a running server the way the kernel stops a filesystem after a fatal I/O error (<c>EXT4_IOC_SHUTDOWN</c>), then
/// unmounted and mounted again.
/// </summary>
public sealed partial class LoopFilesystem : IDisposable
{
    // _IOR('X', 125, __u32): EXT4_IOC_SHUTDOWN, the same number as XFS_IOC_GOINGDOWN
    private const nuint ShutdownRequest = 0x8004587D;

    // EXT4_GOING_FLAGS_NOLOGFLUSH: stop without flushing the journal
    private const uint NoLogFlush = 2;

    private readonly string _image;

    private bool _mounted;

    private LoopFilesystem(string image, string root)
    {
        _image = image;
        Root = root;
    }

    public string Root { get; }

    private static readonly Lazy<string?> LoopRefusal = new(ProbeLoopMount);

    /// <summary>Null when this machine can make and mount a loop ext4 filesystem, else why not.</summary>
    public static string? CannotMount() => CannotInstall() ?? LoopRefusal.Value;

    /// <summary>
    /// Why a loop ext4 filesystem cannot be made for a reason an installer could mend (not root, no mkfs.ext4), else null.
    /// A kernel or sandbox that gives this process no loop device is not such a reason: see <see cref="CannotMount"/>.
    /// </summary>
    public static string? CannotInstall() =>
        SmallMount.CannotMount() ?? (File.Exists("/sbin/mkfs.ext4") || File.Exists("/usr/sbin/mkfs.ext4") ? null : "mkfs.ext4 is not installed");

    /// <summary>
    /// Makes, mounts and unmounts a tiny ext4 image once: a machine can have root, mkfs.ext4 and even
    /// <c>/dev/loop-control</c> and still refuse a loop mount (a container without loop device nodes).
    /// </summary>
    private static string? ProbeLoopMount()
    {
        if (!File.Exists("/dev/loop-control"))
        {
            return "this kernel or sandbox gives no loop devices (/dev/loop-control is missing)";
        }
        var folder = Path.Combine(Path.GetTempPath(), "opslvp-loop-probe-" + Guid.NewGuid().ToString("N"));
        try
        {
            using var probe = Create(folder, 8);
            return null;
        }
        catch (Exception e) when (e is InvalidOperationException or IOException or System.ComponentModel.Win32Exception)
        {
            return "this kernel or sandbox refused a loop mount: " + e.Message;
        }
        finally
        {
            try
            {
                Directory.Delete(folder, recursive: true);
            }
            catch (IOException)
            {
            }
        }
    }

    public static LoopFilesystem Create(string folder, int megabytes)
    {
        Directory.CreateDirectory(folder);
        var image = Path.Combine(folder, "ext4.img");
        using (var file = new FileStream(image, FileMode.Create, FileAccess.Write))
        {
            file.SetLength(megabytes * 1024L * 1024L);
        }
        Run("mkfs.ext4", "-q", "-F", image);
        var fs = new LoopFilesystem(image, Path.Combine(folder, "mnt"));
        fs.Mount();
        return fs;
    }

    public void Mount()
    {
        Directory.CreateDirectory(Root);
        Run("mount", "-o", "loop", _image, Root);
        _mounted = true;
    }

    public void Unmount()
    {
        if (_mounted)
        {
            Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
            Run("umount", Root);
            _mounted = false;
        }
    }

    /// <summary>Shuts the filesystem down: from now on every read and write on it fails until it is mounted again.</summary>
    public void ShutDown(string anyFileOnIt)
    {
        using var handle = File.OpenHandle(anyFileOnIt, FileMode.Open, FileAccess.Read);
        var flags = NoLogFlush;
        if (Ioctl((int)handle.DangerousGetHandle(), ShutdownRequest, ref flags) != 0)
        {
            throw new InvalidOperationException($"EXT4_IOC_SHUTDOWN failed: errno {Marshal.GetLastPInvokeError()}");
        }
    }

    public void Dispose()
    {
        try
        {
            Unmount();
        }
        catch (InvalidOperationException)
        {
            Run("umount", "-l", Root);
        }
        File.Delete(_image);
    }

    [LibraryImport("libc", EntryPoint = "ioctl", SetLastError = true)]
    private static partial int Ioctl(int fd, nuint request, ref uint flags);

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
