namespace OpsLvp.Benchmarks;

/// <summary>Temporary folders of the benchmarks.</summary>
public static class BenchFiles
{
    /// <summary>Deletes the folder and everything in it; a leftover temporary folder is harmless, so failure is ignored.</summary>
    public static void TryDeleteFolder(string folder)
    {
        try
        {
            Directory.Delete(folder, recursive: true);
        }
        catch (IOException)
        {
            // A leftover temporary folder is harmless.
        }
    }
}
