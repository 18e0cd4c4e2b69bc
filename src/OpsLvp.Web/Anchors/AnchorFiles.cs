namespace OpsLvp.Web.Anchors;

/// <summary>The resolved key and anchor log paths, both outside the data folder (docs/audit.md "Anchors").</summary>
public sealed record AnchorFiles(string KeyPath, string LogPath);
