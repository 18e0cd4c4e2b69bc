namespace OpsLvp.Web.Hosting;

/// <summary>
/// Where the app finds its settings, pages' scripts and its own files when started from any working folder
/// (docs/deployment.md "Folders"). ASP.NET Core takes the working folder as content root; a published build started
/// as <c>dotnet /opt/opslvp/OpsLvp.Web.dll</c> from elsewhere then loaded no <c>appsettings.json</c> and served
/// Blazor's and MudBlazor's scripts as empty files. So, unless a content root is given explicitly
/// (<c>--contentRoot</c>, <c>ASPNETCORE_CONTENTROOT</c>, <c>DOTNET_CONTENTROOT</c>), a working folder without
/// <c>appsettings.json</c> gives way to the application's own folder (<see cref="AppContext.BaseDirectory"/>) when that
/// one has it; the web root is then that folder's <c>wwwroot</c>. Relative settings (<c>Engine:ProfilePath</c>,
/// <c>Assets:Folder</c>, <c>Storage:DataFolder</c>) are resolved from the content root (<see cref="ContentPaths"/>).
/// </summary>
public static class StartupPaths
{
    public const string SettingsFile = "appsettings.json";

    /// <summary>The options to build the app with from <paramref name="args"/>, the working folder and the app's folder.</summary>
    public static WebApplicationOptions Options(string[] args, string workingFolder, string appFolder, Func<string, string?> environment)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(environment);
        var root = ContentRoot(args, workingFolder, appFolder, environment);
        return root is null ? new WebApplicationOptions { Args = args } : new WebApplicationOptions { Args = args, ContentRootPath = root };
    }

    /// <summary>
    /// The content root to use, or null to keep ASP.NET Core's choice (an explicit content root, or a working folder
    /// that has the settings file, e.g. <c>dotnet run</c> in the project folder).
    /// </summary>
    public static string? ContentRoot(string[] args, string workingFolder, string appFolder, Func<string, string?> environment)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(environment);
        var explicitRoot = args.Any(a => a.TrimStart('-', '/').StartsWith("contentRoot", StringComparison.OrdinalIgnoreCase))
            || !string.IsNullOrEmpty(environment("ASPNETCORE_CONTENTROOT"))
            || !string.IsNullOrEmpty(environment("DOTNET_CONTENTROOT"));
        if (explicitRoot || File.Exists(Path.Combine(workingFolder, SettingsFile)))
        {
            return null;
        }
        return File.Exists(Path.Combine(appFolder, SettingsFile)) ? Path.GetFullPath(appFolder) : null;
    }

    /// <summary>The build's map of static files (framework and package scripts) beside OpsLvp.Web.dll in a build output, not in a published folder.</summary>
    public static string BuildManifest(IWebHostEnvironment environment)
    {
        ArgumentNullException.ThrowIfNull(environment);
        return Path.Combine(AppContext.BaseDirectory, $"{environment.ApplicationName}.staticwebassets.runtime.json");
    }

    /// <summary>
    /// Outside Development a build output (not a published folder) has the pages' scripts only through the build's
    /// static-file map, which ASP.NET Core reads only in Development: read it here too, so a build output started
    /// in another environment serves real scripts rather than empty ones. True when the map is used.
    /// </summary>
    public static bool UseBuildAssetsWhenNotPublished(WebApplicationBuilder builder)
    {
        ArgumentNullException.ThrowIfNull(builder);
        var environment = builder.Environment;
        if (environment.IsDevelopment() || File.Exists(BlazorScript(environment)) || !File.Exists(BuildManifest(environment)))
        {
            return false;
        }
        builder.WebHost.UseStaticWebAssets();
        return true;
    }

    /// <summary>
    /// What the app cannot run without, as one message naming each missing file; null when all is there. The pages'
    /// scripts are checked outside Development where no build map serves them (a published build's web root).
    /// </summary>
    public static string? Missing(IWebHostEnvironment environment)
    {
        ArgumentNullException.ThrowIfNull(environment);
        var missing = new List<string>();
        if (!File.Exists(Path.Combine(environment.ContentRootPath, SettingsFile)))
        {
            missing.Add($"{SettingsFile} in the content root {environment.ContentRootPath}");
        }
        if (!environment.IsDevelopment() && !File.Exists(BlazorScript(environment)) && !File.Exists(BuildManifest(environment)))
        {
            missing.Add($"_framework/blazor.web.js in the web root {WebRoot(environment)} (start the output of 'dotnet publish', or give --contentRoot the published folder)");
        }
        return missing.Count == 0
            ? null
            : $"OpsLvp cannot start: missing {string.Join("; ", missing)}. The application folder is {AppContext.BaseDirectory}; see docs/deployment.md.";
    }

    private static string WebRoot(IWebHostEnvironment environment) =>
        string.IsNullOrEmpty(environment.WebRootPath) ? Path.Combine(environment.ContentRootPath, "wwwroot") : environment.WebRootPath;

    private static string BlazorScript(IWebHostEnvironment environment) => Path.Combine(WebRoot(environment), "_framework", "blazor.web.js");
}
