namespace OpsLvp.Web.Components.Shell;

/// <summary>The permanent safety line shown on every page (README.md, "Safety").</summary>
public static class SafetyNotice
{
    public const string Text =
        "OpsLvp supports, and does not replace, the aerodrome's approved LVP instructions, ATC procedures and local regulation. Demo thresholds are illustrative.";
}
