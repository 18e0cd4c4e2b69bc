using System.Security.Cryptography;
using System.Text;

namespace OpsLvp.Web.Feeds;

/// <summary>Matches an <c>X-Api-Key</c> value against the configured push keys in constant time per key.</summary>
public static class PushKeys
{
    /// <summary>The name of the matching key, or null.</summary>
    public static string? Match(IEnumerable<PushApiKey> keys, string presented)
    {
        var presentedBytes = Encoding.UTF8.GetBytes(presented);
        string? match = null;
        foreach (var key in keys)
        {
            if (CryptographicOperations.FixedTimeEquals(Encoding.UTF8.GetBytes(key.Key), presentedBytes))
            {
                match ??= key.Name;
            }
        }

        return match;
    }
}
