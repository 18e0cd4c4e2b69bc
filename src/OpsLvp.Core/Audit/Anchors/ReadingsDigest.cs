using System.Globalization;
using System.Security.Cryptography;

namespace OpsLvp.Core.Audit.Anchors;

/// <summary>
/// Count and SHA-256 of a run of stored readings (docs/audit.md "Readings covered"). Readings are taken in id order;
/// the digest is SHA-256 over N("opslvp.readings.v1") followed, per reading, by N(id) ‖ N(received_at) ‖ N(source) ‖
/// N(sensor) ‖ N(kind) ‖ N(time) ‖ N(value) ‖ N(status) ‖ N(accepted "1"/"0") ‖ N(reject_reason) ‖ N(reject_detail),
/// an absent value written as <c>~</c>; times as in the audit entry (UTC, seven fraction digits), the value as the
/// shortest round-trip decimal of the stored double ("R", invariant culture).
/// </summary>
public sealed class ReadingsDigest : IDisposable
{
    public const string FormatTag = "opslvp.readings.v1";

    private readonly IncrementalHash _sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);

    public ReadingsDigest() => _sha.AppendData(new Netstrings().Add(FormatTag).ToArray());

    public long Count { get; private set; }

    public long LastId { get; private set; }

    public void Add(long id, DateTimeOffset receivedAt, string source, string sensor, string kind, DateTimeOffset? time, double? value, string? status, bool accepted, string? rejectReason, string? rejectDetail)
    {
        _sha.AppendData(new Netstrings()
            .Add(id)
            .Add(AuditCanonical.FormatTime(receivedAt))
            .Add(source)
            .Add(sensor)
            .Add(kind)
            .Add(time is { } t ? AuditCanonical.FormatTime(t) : null)
            .Add(value is { } v ? v.ToString("R", CultureInfo.InvariantCulture) : null)
            .Add(status)
            .Add(accepted ? "1" : "0")
            .Add(rejectReason)
            .Add(rejectDetail)
            .ToArray());
        Count++;
        LastId = id;
    }

    /// <summary>Lowercase hex; the digest can be taken once.</summary>
    public string Finish() => Convert.ToHexStringLower(_sha.GetHashAndReset());

    public void Dispose() => _sha.Dispose();
}
