namespace OpsLvp.Data.Stores;

/// <summary>A freshly issued credential with its secret, which is shown once and never stored in clear.</summary>
public sealed record IssuedCredential(AccessCredential Credential, string Secret);
