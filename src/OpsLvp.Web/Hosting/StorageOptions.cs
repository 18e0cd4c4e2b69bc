namespace OpsLvp.Web.Hosting;

/// <summary>Configuration section <c>Storage</c>: where the app keeps its files (SQLite database, keys).</summary>
public sealed class StorageOptions
{
    public const string SectionName = "Storage";

    /// <summary>Data folder; relative paths are under the content root. Created at start.</summary>
    public string DataFolder { get; set; } = "App_Data";
}
