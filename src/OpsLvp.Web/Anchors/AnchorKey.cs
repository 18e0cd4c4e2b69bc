using System.Security.Cryptography;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Anchors;

/// <summary>
/// The ECDSA P-256 key that signs anchors and seals the engine state row (docs/audit.md "Anchors", "State seal"),
/// read from its PEM file, or generated into it (owner read/write only) at first use when the file is missing.
/// </summary>
public sealed class AnchorKey : IStateSealer, IDisposable
{
    private readonly Lazy<ECDsa> _key;

    public AnchorKey(AnchorFiles files, ILogger<AnchorKey> logger)
    {
        ArgumentNullException.ThrowIfNull(files);
        _key = new Lazy<ECDsa>(() => Load(files.KeyPath, logger), LazyThreadSafetyMode.ExecutionAndPublication);
    }

    public ECDsa Key => _key.Value;

    /// <summary>SubjectPublicKeyInfo DER, base64.</summary>
    public string PublicKey => Convert.ToBase64String(Key.ExportSubjectPublicKeyInfo());

    public string Fingerprint => AuditAnchor.Fingerprint(PublicKey);

    public string? Seal(long sequence, string? hash, string stateJson, string profileVersion) =>
        StateSeal.Sign(Key, sequence, hash, stateJson, profileVersion);

    public bool VerifySeal(PersistedEngineState state)
    {
        ArgumentNullException.ThrowIfNull(state);
        return StateSeal.Verify(Key, state.StateSignature, state.AuditSequence, state.AuditHash, state.StateJson, state.ProfileVersion);
    }

    public void Dispose()
    {
        if (_key.IsValueCreated)
        {
            _key.Value.Dispose();
        }
    }

    /// <summary>Where the public key is written when the key is generated: <c>anchor-key.pem</c> → <c>anchor-key.pub.pem</c>.</summary>
    public static string PublicKeyPath(string keyPath) => Path.ChangeExtension(keyPath, ".pub.pem");

    private static ECDsa Load(string path, ILogger logger)
    {
        var key = ECDsa.Create();
        try
        {
            if (File.Exists(path))
            {
                key.ImportFromPem(File.ReadAllText(path));
                if (key.KeySize != 256 || key.ExportParameters(false).Curve.Oid.Value != ECCurve.NamedCurves.nistP256.Oid.Value)
                {
                    throw new InvalidOperationException($"Anchors:KeyPath '{path}' is not an ECDSA P-256 key");
                }
                return key;
            }
            key.GenerateKey(ECCurve.NamedCurves.nistP256);
            Directory.CreateDirectory(Path.GetDirectoryName(path)!);
            var options = new FileStreamOptions { Mode = FileMode.CreateNew, Access = FileAccess.Write };
            if (!OperatingSystem.IsWindows())
            {
                options.UnixCreateMode = UnixFileMode.UserRead | UnixFileMode.UserWrite;
            }
            using (var file = new FileStream(path, options))
            using (var writer = new StreamWriter(file))
            {
                writer.Write(key.ExportPkcs8PrivateKeyPem());
                writer.Flush();
                file.Flush(flushToDisk: true);
            }
            // the public half beside it, for `opslvp audit verify --public-key` on another machine
            File.WriteAllText(PublicKeyPath(path), key.ExportSubjectPublicKeyInfoPem());
            logger.LogWarning("Anchor key generated at {Path} (public key fingerprint {Fingerprint}); keep it outside the database and a copy of its public key elsewhere",
                path, AuditAnchor.Fingerprint(Convert.ToBase64String(key.ExportSubjectPublicKeyInfo())));
            return key;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or CryptographicException or ArgumentException)
        {
            key.Dispose();
            throw new InvalidOperationException($"Anchors:KeyPath '{path}': the anchor key cannot be read or created: {ex.Message}", ex);
        }
    }
}
