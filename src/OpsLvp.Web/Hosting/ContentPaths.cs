namespace OpsLvp.Web.Hosting;

/// <summary>
/// Resolves configured relative paths: first against the content root, then against each parent folder
/// in turn, so repository-level folders (<c>seed-demo/</c>, <c>wwwroot-assets/</c>) are found when the app
/// runs from <c>src/OpsLvp.Web</c> or from a build output folder. Absolute paths are used as given.
/// </summary>
public sealed class ContentPaths(string contentRoot)
{
    public string ContentRoot { get; } = Path.GetFullPath(contentRoot);

    /// <summary>The first existing file or folder; if none exists, the path under the content root.</summary>
    public string Resolve(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        if (Path.IsPathRooted(path))
        {
            return Path.GetFullPath(path);
        }

        for (var dir = new DirectoryInfo(ContentRoot); dir is not null; dir = dir.Parent)
        {
            var candidate = Path.Combine(dir.FullName, path);
            if (File.Exists(candidate) || Directory.Exists(candidate))
            {
                return Path.GetFullPath(candidate);
            }
        }

        return Path.GetFullPath(Path.Combine(ContentRoot, path));
    }
}
