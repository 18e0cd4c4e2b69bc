using System.Globalization;
using System.Security.Cryptography;
using System.Text.Json;

namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// A signed chain head: one line of the anchor log (docs/audit.md "Anchors"). The signature (ECDSA P-256 over
/// SHA-256, IEEE P1363 r‖s, base64) covers <see cref="SignedBytes"/>:
/// N("opslvp.anchor.v1") ‖ N(sequence) ‖ N(hash) ‖ N(time) ‖ N(reset "1"/"0") ‖ N(key fingerprint).
/// </summary>
/// <param name="Sequence">Sequence of the chain head signed (0 for an empty chain).</param>
/// <param name="Hash">Hash of that entry (the genesis value for an empty chain).</param>
/// <param name="Time">Real UTC time of signing.</param>
/// <param name="Reset">True on the first anchor after an administrator acknowledged a mismatch: the anchors before it described a chain that was acknowledged as lost.</param>
/// <param name="PublicKey">The signer's public key, SubjectPublicKeyInfo DER in base64.</param>
/// <param name="Signature">Base64 IEEE P1363 signature.</param>
public sealed record AuditAnchor(long Sequence, string Hash, DateTimeOffset Time, bool Reset, string PublicKey, string Signature)
{
    public const string FormatTag = "opslvp.anchor.v1";

    /// <summary>Lowercase hex SHA-256 of the DER public key.</summary>
    public string KeyFingerprint => Fingerprint(PublicKey);

    public static string Fingerprint(string publicKeyBase64) =>
        Convert.ToHexStringLower(SHA256.HashData(Convert.FromBase64String(publicKeyBase64)));

    public static byte[] SignedBytes(long sequence, string hash, DateTimeOffset time, bool reset, string fingerprint) =>
        new Netstrings().Add(FormatTag).Add(sequence).Add(hash).Add(AuditCanonical.FormatTime(time)).Add(reset ? "1" : "0").Add(fingerprint).ToArray();

    /// <summary>Signs the head with <paramref name="key"/> (a P-256 private key).</summary>
    public static AuditAnchor Sign(ECDsa key, long sequence, string hash, DateTimeOffset time, bool reset)
    {
        ArgumentNullException.ThrowIfNull(key);
        var publicKey = Convert.ToBase64String(key.ExportSubjectPublicKeyInfo());
        var signature = key.SignData(SignedBytes(sequence, hash, time, reset, Fingerprint(publicKey)), HashAlgorithmName.SHA256, DSASignatureFormat.IeeeP1363FixedFieldConcatenation);
        return new AuditAnchor(sequence, hash, time, reset, publicKey, Convert.ToBase64String(signature));
    }

    /// <summary>True when the signature is valid for the line's own public key.</summary>
    public bool SignatureValid()
    {
        try
        {
            using var key = ECDsa.Create();
            key.ImportSubjectPublicKeyInfo(Convert.FromBase64String(PublicKey), out _);
            if (key.KeySize != 256)
            {
                return false;
            }
            return key.VerifyData(SignedBytes(Sequence, Hash, Time, Reset, KeyFingerprint), Convert.FromBase64String(Signature), HashAlgorithmName.SHA256, DSASignatureFormat.IeeeP1363FixedFieldConcatenation);
        }
        catch (Exception ex) when (ex is CryptographicException or FormatException)
        {
            return false;
        }
    }

    /// <summary>The anchor log line (one JSON object, no line break).</summary>
    public string ToJsonLine()
    {
        using var buffer = new MemoryStream();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteString("format", FormatTag);
            json.WriteNumber("sequence", Sequence);
            json.WriteString("hash", Hash);
            json.WriteString("time", AuditCanonical.FormatTime(Time));
            json.WriteBoolean("reset", Reset);
            json.WriteString("key", KeyFingerprint);
            json.WriteString("public_key", PublicKey);
            json.WriteString("signature", Signature);
            json.WriteEndObject();
        }
        return System.Text.Encoding.UTF8.GetString(buffer.ToArray());
    }

    /// <summary>Reads one anchor log line.</summary>
    /// <exception cref="FormatException">Not an anchor line (reason in the message).</exception>
    public static AuditAnchor Parse(string line)
    {
        try
        {
            using var doc = JsonDocument.Parse(line);
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object || Str(root, "format") != FormatTag)
            {
                throw new FormatException($"not an '{FormatTag}' object");
            }
            var time = Str(root, "time");
            if (!DateTimeOffset.TryParseExact(time, AuditCanonical.TimeFormat, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal, out var at))
            {
                throw new FormatException($"time '{time}' is not in the canonical format");
            }
            var hash = Str(root, "hash");
            if (!AuditChain.IsHash(hash))
            {
                throw new FormatException("hash is not 64 lowercase hex digits");
            }
            if (!root.TryGetProperty("sequence", out var seq) || seq.ValueKind != JsonValueKind.Number || !seq.TryGetInt64(out var sequence) || sequence < 0)
            {
                throw new FormatException("sequence is not a whole number ≥ 0");
            }
            if (!root.TryGetProperty("reset", out var reset) || reset.ValueKind is not (JsonValueKind.True or JsonValueKind.False))
            {
                throw new FormatException("reset is not true or false");
            }
            var publicKey = Str(root, "public_key") ?? throw new FormatException("public_key missing");
            var anchor = new AuditAnchor(sequence, hash!, at, reset.GetBoolean(), publicKey, Str(root, "signature") ?? throw new FormatException("signature missing"));
            if (Str(root, "key") != anchor.KeyFingerprint)
            {
                throw new FormatException("key is not the fingerprint of public_key");
            }
            return anchor;
        }
        catch (JsonException ex)
        {
            throw new FormatException($"not JSON: {ex.Message}", ex);
        }
        catch (ArgumentException ex)
        {
            throw new FormatException(ex.Message, ex);
        }
    }

    private static string? Str(JsonElement root, string name) =>
        root.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString() : null;
}
