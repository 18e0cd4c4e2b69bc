using System.Collections.Frozen;
using System.Text.Json;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// A command sent from a node that does not lead to the leader (docs/deployment.md "Fan-out and commands between
/// nodes"): who asks (name, roles, teams, as the standby's sign-in established them), the command by its type name, and
/// when the sending node sent it (its real clock), so the leader can refuse a captured message replayed later. It
/// travels protected by <see cref="ClusterSeal"/>: the leader believes none of it unless a node of this installation sealed it.
/// </summary>
public sealed record ForwardedCommand(string Id, string FromNode, string Caller, string[] Roles, string[] Teams, bool Authenticated, string Type, JsonElement Command, DateTimeOffset SentAt)
{
    private static readonly FrozenDictionary<string, Type> s_types = typeof(EngineCommand).Assembly.GetTypes()
        .Where(t => t.IsSubclassOf(typeof(EngineCommand)) && !t.IsAbstract)
        .ToFrozenDictionary(t => t.Name, StringComparer.Ordinal);

    public static ForwardedCommand From(string id, string fromNode, CommandCaller caller, EngineCommand command, DateTimeOffset sentAt)
    {
        ArgumentNullException.ThrowIfNull(caller);
        ArgumentNullException.ThrowIfNull(command);
        return new(id, fromNode, caller.Name, [.. caller.Roles], [.. caller.Teams], caller.Authenticated, command.GetType().Name,
            JsonSerializer.SerializeToElement(command, command.GetType(), LiveJson.Options), sentAt);
    }

    /// <summary>The caller as the standby had it.</summary>
    public CommandCaller ToCaller() =>
        new(Caller, Roles.ToHashSet(StringComparer.Ordinal), Teams.ToHashSet(StringComparer.Ordinal), Authenticated);

    /// <summary>The engine command, or null when <see cref="Type"/> names none (a newer node's command, or garbage).</summary>
    /// <exception cref="JsonException">The command's fields do not fit its type.</exception>
    public EngineCommand? ToCommand() =>
        s_types.TryGetValue(Type, out var type) ? (EngineCommand?)Command.Deserialize(type, LiveJson.Options) : null;
}
