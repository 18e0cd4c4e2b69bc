using System.Security.Cryptography;
using System.Text;

namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// The signature that binds the stored engine state to the audit entry it reflects (docs/audit.md "State seal"):
/// ECDSA P-256 with the anchor key over N("opslvp.state.v1") ‖ N(sequence) ‖ N(hash or absent) ‖
/// N(SHA-256 hex of the state JSON's UTF-8 bytes) ‖ N(profile version). Editing the state JSON, its sequence or hash,
/// or putting back an older row breaks it.
/// </summary>
public static class StateSeal
{
    public const string FormatTag = "opslvp.state.v1";

    public static string StateDigest(string stateJson) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(stateJson)));

    public static byte[] SignedBytes(long sequence, string? hash, string stateJson, string profileVersion) =>
        new Netstrings().Add(FormatTag).Add(sequence).Add(hash).Add(StateDigest(stateJson)).Add(profileVersion).ToArray();

    /// <summary>Base64 IEEE P1363 signature.</summary>
    public static string Sign(ECDsa key, long sequence, string? hash, string stateJson, string profileVersion)
    {
        ArgumentNullException.ThrowIfNull(key);
        return Convert.ToBase64String(key.SignData(SignedBytes(sequence, hash, stateJson, profileVersion), HashAlgorithmName.SHA256, DSASignatureFormat.IeeeP1363FixedFieldConcatenation));
    }

    public static bool Verify(ECDsa publicKey, string? signature, long sequence, string? hash, string stateJson, string profileVersion)
    {
        ArgumentNullException.ThrowIfNull(publicKey);
        if (string.IsNullOrEmpty(signature))
        {
            return false;
        }
        try
        {
            return publicKey.VerifyData(SignedBytes(sequence, hash, stateJson, profileVersion), Convert.FromBase64String(signature), HashAlgorithmName.SHA256, DSASignatureFormat.IeeeP1363FixedFieldConcatenation);
        }
        catch (FormatException)
        {
            return false;
        }
    }
}
