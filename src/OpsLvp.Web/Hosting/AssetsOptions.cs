namespace OpsLvp.Web.Hosting;

/// <summary>Configuration section <c>Assets</c>: the app's own static files, served under <c>/assets</c>.</summary>
public sealed class AssetsOptions
{
    public const string SectionName = "Assets";

    /// <summary>Folder with theme CSS, icons and sounds; relative paths are looked up from the content root upwards.</summary>
    public string Folder { get; set; } = "wwwroot-assets";
}
