namespace OpsLvp.Web.Anchors;

/// <summary>Configuration section <c>Anchors</c>: signed chain heads (docs/audit.md "Anchors").</summary>
public sealed class AnchorOptions
{
    public const string SectionName = "Anchors";

    /// <summary>
    /// Folder for the key and the anchor log when their paths are not set; relative paths are under the content root.
    /// Empty: the data folder's path with <c>-anchors</c> appended (beside it, not inside it).
    /// </summary>
    public string Folder { get; set; } = "";

    /// <summary>PEM (PKCS#8) ECDSA P-256 private key; generated at first start when missing. Empty: <c>anchor-key.pem</c> in <see cref="Folder"/>.</summary>
    public string KeyPath { get; set; } = "";

    /// <summary>Anchor log, one JSON line per signed head. Empty: <c>anchors.jsonl</c> in <see cref="Folder"/>.</summary>
    public string LogPath { get; set; } = "";

    /// <summary>Real time between anchors (at most 5 minutes).</summary>
    public TimeSpan Interval { get; set; } = TimeSpan.FromMinutes(5);
}
