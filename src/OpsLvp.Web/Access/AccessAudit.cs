using System.Text.Json;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Access;

/// <summary>Appends access events (sign-in, failed sign-in, user and credential changes) to the audit chain (docs/engine.md R12).</summary>
public sealed class AccessAudit(AuditStore store, TimeProvider clock)
{
    public const string Anonymous = "anonymous";

    /// <exception cref="AuditCommitException">Not committed; the caller must not carry out the action.</exception>
    public async Task AppendAsync(string actor, string kind, object payload, CancellationToken cancellationToken = default)
    {
        var json = JsonSerializer.Serialize(payload, JsonSerializerOptions.Web);
        await store.AppendAsync([new NewAuditEntry(string.IsNullOrWhiteSpace(actor) ? Anonymous : actor, kind, json, clock.GetUtcNow())], null, cancellationToken);
    }
}
