using System.Security.Cryptography;
using System.Text;

namespace OpsLvp.Data.Stores;

/// <summary>
/// Makes and hashes the high-entropy secrets behind display tokens and API keys. 32 random bytes (256 bits) make
/// guessing hopeless, so a plain SHA-256 is enough to keep a stolen database from yielding usable secrets; a slow
/// password hash would only add latency to every API call (it protects low-entropy human passwords, not these).
/// </summary>
public static class SecretHash
{
    /// <summary>A new secret: <paramref name="prefix"/> followed by 43 base64url characters (256 random bits).</summary>
    public static string NewSecret(string prefix)
    {
        var bytes = RandomNumberGenerator.GetBytes(32);
        return prefix + Convert.ToBase64String(bytes).TrimEnd('=').Replace('+', '-').Replace('/', '_');
    }

    /// <summary>Lower-case hex SHA-256 of the UTF-8 text.</summary>
    public static string Hash(string secret)
    {
        ArgumentNullException.ThrowIfNull(secret);
        return Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(secret)));
    }
}
