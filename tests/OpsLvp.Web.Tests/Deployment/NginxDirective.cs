namespace OpsLvp.Web.Tests.Deployment;

/// <summary>One directive of an nginx configuration: its name, its arguments (quotes removed) and, for a block, its directives.</summary>
public sealed record NginxDirective(string Name, IReadOnlyList<string> Arguments, IReadOnlyList<NginxDirective> Block)
{
    /// <summary>The directives named <paramref name="name"/> in this block and every block below it.</summary>
    public IEnumerable<NginxDirective> All(string name) =>
        Block.SelectMany(d => (d.Name == name ? [d] : Array.Empty<NginxDirective>()).Concat(d.All(name)));

    public override string ToString() => Name + " " + string.Join(' ', Arguments);
}
