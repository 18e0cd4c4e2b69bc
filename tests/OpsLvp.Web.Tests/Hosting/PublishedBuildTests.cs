using System.Diagnostics;
using System.Net;
using System.Text.Json;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Tests.Hosting;

/// <summary>
/// The published build started from another working folder (issue 13; docs/deployment.md). Slow-ish: it runs
/// <c>dotnet publish --no-build</c> of the OpsLvp.Web already built for this test run (about half a minute; a full
/// publish would rebuild the app in Release for minutes on a shared machine, and the output under test would be no
/// more real: the same assemblies, the publish step that lays out wwwroot, assets and demo files is the same), then
/// starts <c>dotnet OpsLvp.Web.dll</c> with a fresh, empty working folder in the Production environment.
/// </summary>
public sealed class PublishedBuildTests
{
    [Fact]
    [Trait("Speed", "Slow")]
    public async Task PublishedBuild_StartedFromAnotherFolder_ServesRealScripts_Assets_Settings_AndProfile_AndLogsNoSql()
    {
        var root = Path.Combine(Path.GetTempPath(), "opslvp-tests", "publish-" + Guid.NewGuid().ToString("N"));
        var app = Path.Combine(root, "app");
        var elsewhere = Path.Combine(root, "elsewhere");
        Directory.CreateDirectory(elsewhere);
        try
        {
            await PublishAsync(app);
            Assert.True(File.Exists(Path.Combine(app, "wwwroot-assets", "opslvp.css")), "wwwroot-assets is not in the publish output");
            Assert.True(File.Exists(Path.Combine(app, "seed-demo", "profile.json")), "seed-demo is not in the publish output");

            // a settings source asking for SQL at Information: the server keeps it at Warning in every environment (issue 13)
            await using var server = await PublishedServer.StartAsync(app, elsewhere, [],
                new Dictionary<string, string> { ["Logging__LogLevel__Microsoft.EntityFrameworkCore"] = "Information" });

            var blazor = await server.Client.GetByteArrayAsync(new Uri("/_framework/blazor.web.js", UriKind.Relative));
            var mud = await server.Client.GetByteArrayAsync(new Uri("/_content/MudBlazor/MudBlazor.min.js", UriKind.Relative));
            Assert.True(blazor.Length > 10_000, $"blazor.web.js served {blazor.Length} bytes");
            Assert.True(mud.Length > 10_000, $"MudBlazor.min.js served {mud.Length} bytes");
            using var css = await server.Client.GetAsync(new Uri("/assets/opslvp.css", UriKind.Relative));
            Assert.Equal(HttpStatusCode.OK, css.StatusCode);
            Assert.Contains(".opslvp-safety-line", await css.Content.ReadAsStringAsync(), StringComparison.Ordinal);
            // appsettings.json loaded (Engine:ProfilePath = seed-demo/profile.json, found beside the dll): the demo profile runs
            var health = JsonDocument.Parse(await server.Client.GetStringAsync(new Uri("/health", UriKind.Relative))).RootElement;
            Assert.Contains("demo-2026.1", health.GetRawText(), StringComparison.Ordinal);
            // the data folder (Storage:DataFolder = App_Data) is under the application's folder, not the working folder
            Assert.True(Directory.Exists(Path.Combine(app, "App_Data")), "no App_Data beside the published dll");
            Assert.Empty(Directory.EnumerateFileSystemEntries(elsewhere));

            // the script the pages actually name (fingerprinted) is served too
            Assert.DoesNotContain(server.Output, l => l.StartsWith("info: Microsoft.EntityFrameworkCore", StringComparison.Ordinal)
                || l.StartsWith("dbug: Microsoft.EntityFrameworkCore", StringComparison.Ordinal));
            Assert.Contains(server.Output, l => l.StartsWith("info: Microsoft.Hosting.Lifetime", StringComparison.Ordinal)); // the console log is read at all

            var page = await server.Client.GetStringAsync(new Uri("/", UriKind.Relative));
            var named = System.Text.RegularExpressions.Regex.Match(page, "src=\"([^\"]*_framework/blazor\\.web[^\"]*\\.js)\"");
            Assert.True(named.Success, "the home page names no blazor.web script");
            var script = await server.Client.GetByteArrayAsync(new Uri("/" + named.Groups[1].Value.TrimStart('/'), UriKind.Relative));
            Assert.True(script.Length > 10_000, $"{named.Groups[1].Value} served {script.Length} bytes");
        }
        finally
        {
            DeleteQuietly(root);
        }
    }

    [Fact]
    [Trait("Speed", "Slow")]
    public async Task ContentRootWithoutSettings_StopsTheStart_WithAMessageNamingWhatIsMissing()
    {
        var root = Path.Combine(Path.GetTempPath(), "opslvp-tests", "publish-" + Guid.NewGuid().ToString("N"));
        var app = Path.Combine(root, "app");
        var empty = Path.Combine(root, "empty");
        Directory.CreateDirectory(empty);
        try
        {
            await PublishAsync(app);
            var (code, output) = await PublishedServer.RunToExitAsync(app, empty, ["--contentRoot", empty]);

            Assert.Equal(2, code);
            Assert.Contains("OpsLvp cannot start: missing appsettings.json in the content root", output, StringComparison.Ordinal);
            Assert.Contains("_framework/blazor.web.js in the web root", output, StringComparison.Ordinal);
        }
        finally
        {
            DeleteQuietly(root);
        }
    }

    [Fact]
    public void ContentRoot_IsTheAppFolder_OnlyWhenTheWorkingFolderHasNoSettings_AndNoneIsGiven()
    {
        var root = Path.Combine(Path.GetTempPath(), "opslvp-tests", "paths-" + Guid.NewGuid().ToString("N"));
        var appFolder = Path.Combine(root, "app");
        var project = Path.Combine(root, "project");
        var bare = Path.Combine(root, "bare");
        Directory.CreateDirectory(appFolder);
        Directory.CreateDirectory(project);
        Directory.CreateDirectory(bare);
        File.WriteAllText(Path.Combine(appFolder, StartupPaths.SettingsFile), "{}");
        File.WriteAllText(Path.Combine(project, StartupPaths.SettingsFile), "{}");
        try
        {
            static string? None(string _) => null;
            Assert.Equal(Path.GetFullPath(appFolder), StartupPaths.ContentRoot([], bare, appFolder, None));
            Assert.Null(StartupPaths.ContentRoot([], project, appFolder, None));
            Assert.Null(StartupPaths.ContentRoot(["--contentRoot", bare], bare, appFolder, None));
            Assert.Null(StartupPaths.ContentRoot(["--contentroot=" + bare], bare, appFolder, None));
            Assert.Null(StartupPaths.ContentRoot([], bare, appFolder, n => n == "ASPNETCORE_CONTENTROOT" ? bare : null));
            Assert.Null(StartupPaths.ContentRoot([], bare, bare, None));
        }
        finally
        {
            DeleteQuietly(root);
        }
    }

    /// <summary><c>dotnet publish --no-build</c> of OpsLvp.Web in this run's configuration into <paramref name="output"/>.</summary>
    private static async Task PublishAsync(string output)
    {
        var here = new DirectoryInfo(AppContext.BaseDirectory);
        var configuration = here.Parent!.Name;
        var repo = here;
        while (repo is not null && !File.Exists(Path.Combine(repo.FullName, "OpsLvp.sln")))
        {
            repo = repo.Parent;
        }
        Assert.NotNull(repo);
        var start = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in new[] { "publish", Path.Combine(repo.FullName, "src", "OpsLvp.Web", "OpsLvp.Web.csproj"), "-c", configuration, "--no-build", "-o", output, "-nologo" })
        {
            start.ArgumentList.Add(a);
        }
        start.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        start.Environment["DOTNET_NOLOGO"] = "1";
        using var process = Process.Start(start)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromMinutes(5));
        await process.WaitForExitAsync(timeout.Token);
        Assert.True(process.ExitCode == 0, $"dotnet publish failed ({process.ExitCode}): {await stdout}{await stderr}");
    }

    private static void DeleteQuietly(string folder)
    {
        try
        {
            Directory.Delete(folder, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }
}
