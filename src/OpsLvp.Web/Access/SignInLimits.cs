namespace OpsLvp.Web.Access;

/// <summary>Input limits of the sign-in form, checked before anything is looked up or stored.</summary>
public static class SignInLimits
{
    /// <summary>Longest user name accepted, characters (common practice; demo names are under 20).</summary>
    public const int MaxUserNameLength = 64;

    /// <summary>Longest password accepted, characters (NIST SP 800-63B §5.1.1.2 asks for at least 64, from memory).</summary>
    public const int MaxPasswordLength = 256;
}
