namespace OpsLvp.Web.Access;

/// <summary>One entry of <c>seed-demo/users.json</c> (invented people).</summary>
public sealed record DemoUser(string Name, string DisplayName, string Role, IReadOnlyList<string> Teams);
