namespace OpsLvp.Web.Retention;

/// <summary>The resolved readings export folder (<see cref="RetentionOptions.ExportFolder"/>).</summary>
public sealed record RetentionFolder(string Path);
