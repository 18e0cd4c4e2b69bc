using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Access;

/// <summary>
/// Issues and revokes display links and API keys for administrators; every change is written to the audit chain
/// first (nothing changes when that fails). A revocation also sweeps the hub at once; circuits follow within
/// <see cref="AccessOptions.RevalidationInterval"/>.
/// </summary>
public sealed class CredentialAdmin(DisplayTokenStore displays, ApiKeyStore keys, AccessAudit audit, HubConnectionMonitor hub, TimeProvider clock)
{
    public Task<IReadOnlyList<AccessCredential>> ListDisplaysAsync(CancellationToken cancellationToken = default) => displays.ListAsync(cancellationToken);

    public Task<IReadOnlyList<AccessCredential>> ListKeysAsync(CancellationToken cancellationToken = default) => keys.ListAsync(cancellationToken);

    /// <exception cref="ArgumentException">Bad name.</exception>
    /// <exception cref="AuditCommitException">Not recorded, not issued.</exception>
    public async Task<IssuedCredential> IssueDisplayAsync(string actor, string name, CancellationToken cancellationToken = default)
    {
        var checkedName = CredentialNames.Check(name);
        await audit.AppendAsync(actor, AccessAuditKinds.DisplayTokenIssued, new { name = checkedName }, cancellationToken);
        return await displays.IssueAsync(checkedName, actor, clock.GetUtcNow(), cancellationToken);
    }

    /// <exception cref="AuditCommitException">Not recorded, not revoked.</exception>
    public async Task<bool> RevokeDisplayAsync(string actor, long id, CancellationToken cancellationToken = default)
    {
        await audit.AppendAsync(actor, AccessAuditKinds.DisplayTokenRevoked, new { id }, cancellationToken);
        var revoked = await displays.RevokeAsync(id, clock.GetUtcNow(), cancellationToken);
        await hub.SweepAsync(cancellationToken);
        return revoked;
    }

    /// <exception cref="ArgumentException">Bad name or scopes.</exception>
    /// <exception cref="AuditCommitException">Not recorded, not issued.</exception>
    public async Task<IssuedCredential> IssueKeyAsync(string actor, string name, IReadOnlyCollection<string> scopes, CancellationToken cancellationToken = default)
    {
        var checkedName = CredentialNames.Check(name);
        if (scopes.Count == 0 || scopes.Any(s => !ApiKeyStore.KnownScopes.Contains(s)))
        {
            throw new ArgumentException($"choose one or more scopes from {string.Join(", ", ApiKeyStore.KnownScopes)}", nameof(scopes));
        }
        await audit.AppendAsync(actor, AccessAuditKinds.ApiKeyIssued, new { name = checkedName, scopes }, cancellationToken);
        return await keys.IssueAsync(checkedName, scopes, actor, clock.GetUtcNow(), cancellationToken);
    }

    /// <exception cref="AuditCommitException">Not recorded, not revoked.</exception>
    public async Task<bool> RevokeKeyAsync(string actor, long id, CancellationToken cancellationToken = default)
    {
        await audit.AppendAsync(actor, AccessAuditKinds.ApiKeyRevoked, new { id }, cancellationToken);
        var revoked = await keys.RevokeAsync(id, clock.GetUtcNow(), cancellationToken);
        await hub.SweepAsync(cancellationToken);
        return revoked;
    }
}
