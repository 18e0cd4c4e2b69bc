namespace OpsLvp.Web.Access;

/// <summary>Audit entry kinds written by access control.</summary>
public static class AccessAuditKinds
{
    public const string SignIn = "sign-in";
    public const string SignInFailed = "sign-in-failed";
    public const string SignInFailedSummary = "sign-in-failed-summary";
    public const string SignOut = "sign-out";
    public const string SetupAdministrator = "setup-administrator";
    public const string UserCreated = "user-created";
    public const string UserDisabled = "user-disabled";
    public const string UserEnabled = "user-enabled";
    public const string PasswordReset = "user-password-reset";
    public const string RolesSet = "user-roles-set";
    public const string DisplayTokenIssued = "display-token-issued";
    public const string DisplayTokenRevoked = "display-token-revoked";
    public const string DisplaySignIn = "display-sign-in";
    public const string ApiKeyIssued = "api-key-issued";
    public const string ApiKeyRevoked = "api-key-revoked";
}
