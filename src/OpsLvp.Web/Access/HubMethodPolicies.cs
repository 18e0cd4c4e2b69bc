namespace OpsLvp.Web.Access;

/// <summary>
/// The policy each client-to-server hub method needs. A hub method not listed here is refused at call time, and the
/// access tests fail for it, so adding a method means deciding who may call it.
/// </summary>
public static class HubMethodPolicies
{
    public static IReadOnlyDictionary<string, string> Table { get; } = new Dictionary<string, string>(StringComparer.Ordinal);
}
