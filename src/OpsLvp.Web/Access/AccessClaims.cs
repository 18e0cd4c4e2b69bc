namespace OpsLvp.Web.Access;

/// <summary>Claim types this app adds besides roles and <see cref="Commands.CommandCaller.TeamClaimType"/>.</summary>
public static class AccessClaims
{
    /// <summary>On a kiosk principal: the display token id.</summary>
    public const string DisplayToken = "opslvp:display";

    /// <summary>On a machine principal: the API key id (0 for a configuration bootstrap key).</summary>
    public const string ApiKey = "opslvp:api-key";

    /// <summary>On a machine principal: one claim per scope (ingest, hub-read).</summary>
    public const string Scope = "opslvp:scope";
}
