using System.Security.Cryptography;
using CsCheck;
using OpsLvp.Core.Audit.Anchors;

namespace OpsLvp.Core.Tests.Audit;

/// <summary>
/// Signed chain heads, the state seal and the readings digest (docs/audit.md "Anchors", "State seal", "Readings
/// covered"). ECDSA P-256 with SHA-256 as in FIPS 186-5 (the BCL's implementation); all heads and readings invented.
/// </summary>
public class AnchorTests
{
    private static readonly DateTimeOffset s_t0 = new(2026, 1, 2, 3, 4, 5, TimeSpan.Zero);

    private static readonly string s_hashA = new('a', 64);

    private static readonly string s_hashB = new('b', 64);

    [Fact]
    public void Anchor_SurvivesItsLine_AndVerifies()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        var anchor = AuditAnchor.Sign(key, 42, s_hashA, s_t0, reset: false);

        var read = AuditAnchor.Parse(anchor.ToJsonLine());

        Assert.Equal(anchor, read);
        Assert.True(read.SignatureValid());
        Assert.Equal(Convert.ToHexStringLower(SHA256.HashData(key.ExportSubjectPublicKeyInfo())), read.KeyFingerprint);
    }

    [Fact]
    public void Anchor_AnySignedFieldChanged_NoLongerVerifies()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        Gen.Select(Gen.Long[1, 1_000_000], Gen.Long[1, 1_000_000], Gen.Int[0, 3]).Sample((sequence, other, field) =>
        {
            var anchor = AuditAnchor.Sign(key, sequence, s_hashA, s_t0, reset: false);
            var changed = field switch
            {
                0 => anchor with { Sequence = sequence == other ? other + 1 : other },
                1 => anchor with { Hash = s_hashB },
                2 => anchor with { Time = anchor.Time.AddTicks(other) },
                _ => anchor with { Reset = true },
            };
            Assert.True(anchor.SignatureValid());
            Assert.False(changed.SignatureValid());
        }, iter: 50);
    }

    [Fact]
    public void Read_ChecksEachLine_AgainstTheTrustedKey()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        using var other = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        var good = AuditAnchor.Sign(key, 3, s_hashA, s_t0, reset: false);
        var forged = good with { Sequence = 9 };
        var foreign = AuditAnchor.Sign(other, 9, s_hashB, s_t0, reset: false);
        var trusted = good.KeyFingerprint;

        var (valid, problems) = AnchorCheck.Read([good.ToJsonLine(), "", "not json", forged.ToJsonLine(), foreign.ToJsonLine()], trusted);

        Assert.Equal([(1, good)], valid);
        Assert.Equal(["anchor_malformed", "anchor_signature_invalid", "anchor_wrong_key"], problems.Select(p => p.Kind));
        Assert.Equal([3, 4, 5], problems.Select(p => p.AnchorLine!.Value));
    }

    [Fact]
    public void Read_WithoutTrustedKey_AllLinesMustNameTheFirstLinesKey()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        using var other = ECDsa.Create(ECCurve.NamedCurves.nistP256);

        var (valid, problems) = AnchorCheck.Read([AuditAnchor.Sign(key, 1, s_hashA, s_t0, false).ToJsonLine(), AuditAnchor.Sign(other, 2, s_hashA, s_t0, false).ToJsonLine()], null);

        Assert.Single(valid);
        Assert.Equal("anchor_wrong_key", Assert.Single(problems).Kind);
    }

    [Fact]
    public void Compare_NamesTruncationAndRewriting()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        var chain = new Dictionary<long, string> { [1] = s_hashA, [2] = s_hashA, [3] = s_hashB };
        var anchors = new List<(int, AuditAnchor)>
        {
            (1, AuditAnchor.Sign(key, 2, s_hashB, s_t0, false)), // the chain has another hash at 2
            (2, AuditAnchor.Sign(key, 3, s_hashB, s_t0.AddMinutes(5), false)),
            (3, AuditAnchor.Sign(key, 7, s_hashA, s_t0.AddMinutes(10), false)), // past the head
        };

        var problems = AnchorCheck.Compare(anchors, 3, s => chain.GetValueOrDefault(s));

        Assert.Equal(["truncated", "rewritten"], problems.Select(p => p.Kind));
        Assert.Equal((7L, 3), (problems[0].Sequence!.Value, problems[0].AnchorLine!.Value));
        Assert.Contains("entries 4–7 were removed", problems[0].Detail, StringComparison.Ordinal);
        Assert.Equal((2L, 1), (problems[1].Sequence!.Value, problems[1].AnchorLine!.Value));
    }

    [Fact]
    public void Compare_OnlyAnchorsFromTheLastResetOn_AreInForce()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        var anchors = new List<(int, AuditAnchor)>
        {
            (1, AuditAnchor.Sign(key, 9, s_hashA, s_t0, false)), // the chain acknowledged as lost
            (2, AuditAnchor.Sign(key, 2, s_hashB, s_t0.AddMinutes(5), reset: true)),
        };

        Assert.Empty(AnchorCheck.Compare(anchors, 2, s => s == 2 ? s_hashB : s_hashA));
        Assert.Equal("truncated", Assert.Single(AnchorCheck.Compare(anchors.Take(1).ToList(), 2, _ => s_hashA)).Kind);
    }

    [Fact]
    public void StateSeal_DetectsAnEditedState_SequenceHashOrProfile()
    {
        using var key = ECDsa.Create(ECCurve.NamedCurves.nistP256);
        const string state = """{"Phase":"Active","EvaluatedAt":"2026-01-02T03:04:05+00:00"}""";
        var seal = StateSeal.Sign(key, 12, s_hashA, state, "p-1");

        Assert.True(StateSeal.Verify(key, seal, 12, s_hashA, state, "p-1"));
        Assert.False(StateSeal.Verify(key, seal, 12, s_hashA, state.Replace("Active", "Normal", StringComparison.Ordinal), "p-1"));
        Assert.False(StateSeal.Verify(key, seal, 11, s_hashA, state, "p-1"));
        Assert.False(StateSeal.Verify(key, seal, 12, s_hashB, state, "p-1"));
        Assert.False(StateSeal.Verify(key, seal, 12, s_hashA, state, "p-2"));
        Assert.False(StateSeal.Verify(key, null, 12, s_hashA, state, "p-1"));
        Assert.False(StateSeal.Verify(key, "not base64!", 12, s_hashA, state, "p-1"));
    }

    [Fact]
    public void ReadingsDigest_AnyFieldOfAnyReadingChanged_ChangesTheDigest()
    {
        Gen.Select(Gen.Int[1, 20], Gen.Int[0, 19], Gen.Int[0, 10]).Sample((count, pick, field) =>
        {
            var target = pick % count;
            Assert.NotEqual(Digest(count, -1, field), Digest(count, target, field));
        }, iter: 100);
    }

    [Fact]
    public void ReadingsDigest_AbsentIsNotEmpty_AndOrderCounts()
    {
        static string One(string? status, double? value)
        {
            using var d = new ReadingsDigest();
            d.Add(1, s_t0, "push", "s", "rvr", s_t0, value, status, false, "malformed", null);
            return d.Finish();
        }

        Assert.NotEqual(One(null, 1), One("", 1));
        Assert.NotEqual(One("ok", null), One("ok", 0));
        using var empty = new ReadingsDigest();
        Assert.Equal(0, empty.Count);
        // an empty window: SHA-256 of N("opslvp.readings.v1") alone; printf '18:opslvp.readings.v1,' | sha256sum
        Assert.Equal("1ccfcbec3d72282ad35d972e02f25c5b0eb839b36c4d7bd6cc471d1a09f09c0d", empty.Finish());
    }

    private static string Digest(int count, int changed, int field)
    {
        using var digest = new ReadingsDigest();
        for (var i = 0; i < count; i++)
        {
            var c = i == changed ? field : -1;
            digest.Add(
                i + (c == 0 ? 100 : 1),
                s_t0.AddSeconds(i + (c == 1 ? 1 : 0)),
                c == 2 ? "push:other" : "push:invented",
                c == 3 ? "s-mid" : "s-tdz",
                c == 4 ? "visibility" : "rvr",
                c == 5 ? null : s_t0.AddSeconds(i),
                c == 6 ? 550.5 : 550,
                c == 7 ? "degraded" : "ok",
                c != 8,
                c == 9 ? "out_of_range" : null,
                c == 10 ? "edited" : null);
        }
        Assert.Equal(count, digest.Count);
        return digest.Finish();
    }
}
