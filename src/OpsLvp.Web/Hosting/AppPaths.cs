namespace OpsLvp.Web.Hosting;

/// <summary>The resolved, existing folders the app works with.</summary>
public sealed record AppPaths(string DataFolder, string AssetsFolder);
