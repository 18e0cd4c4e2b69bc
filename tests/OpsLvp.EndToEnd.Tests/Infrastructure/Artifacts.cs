namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>Where tests save screenshots: <c>OPSLVP_ARTIFACTS</c>, else this project's TestResults/screenshots.</summary>
public static class Artifacts
{
    public const string FolderVariable = "OPSLVP_ARTIFACTS";

    public static string Folder
    {
        get
        {
            var folder = Environment.GetEnvironmentVariable(FolderVariable) is { Length: > 0 } configured
                ? configured
                : Path.Combine(ProjectFolder(), "TestResults", "screenshots");
            Directory.CreateDirectory(folder);
            return Path.GetFullPath(folder);
        }
    }

    public static string PathFor(string fileName) => Path.Combine(Folder, fileName);

    private static string ProjectFolder()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.EndToEnd.Tests.csproj")))
            {
                return dir.FullName;
            }
        }
        return AppContext.BaseDirectory;
    }
}
