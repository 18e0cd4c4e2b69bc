namespace OpsLvp.Web.Access;

/// <summary>The demo sign-ins generated at this start (demo mode only; empty otherwise). DEMO-ONLY credentials.</summary>
public sealed class DemoAccounts
{
    private readonly Dictionary<string, string> _passwords = new(StringComparer.Ordinal);

    public IReadOnlyDictionary<string, string> Passwords => _passwords;

    internal void Set(string userName, string password) => _passwords[userName] = password;
}
