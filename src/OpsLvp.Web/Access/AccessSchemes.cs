namespace OpsLvp.Web.Access;

/// <summary>Authentication scheme names besides Identity's application cookie.</summary>
public static class AccessSchemes
{
    /// <summary>Default: picks the API key, the sign-in cookie or the display cookie for each request.</summary>
    public const string Selector = "OpsLvp";

    /// <summary>Kiosk cookie set by <c>/display/{token}</c>.</summary>
    public const string Display = "OpsLvp.Display";

    /// <summary><c>X-Api-Key</c> header.</summary>
    public const string ApiKey = "OpsLvp.ApiKey";

    public const string SessionCookieName = ".OpsLvp.Session";

    public const string DisplayCookieName = ".OpsLvp.Display";
}
