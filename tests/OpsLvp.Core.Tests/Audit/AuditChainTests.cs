using OpsLvp.Core.Audit;

namespace OpsLvp.Core.Tests.Audit;

public class AuditChainTests
{
    private static readonly DateTimeOffset _t0 = new(2026, 1, 2, 3, 4, 5, TimeSpan.Zero);

    // Known answers computed outside .NET with coreutils sha256sum over the bytes docs/audit.md defines:
    //   G=$(printf '0%.0s' $(seq 64))
    //   E1='15:opslvp.audit.v1,1:1,28:2026-01-02T03:04:05.1234567Z,11:dm.invented,10:transition,48:{"from":"normal","rvr_m":550,"to":"preparation"},'
    //   printf '%s%s' "$G" "$E1" | sha256sum
    //   E2='15:opslvp.audit.v1,1:2,28:2026-01-02T03:04:06.0000000Z,13:Zoë Invented,4:tick,51:{"note":"Zoë: fog \"thick\"","visibility_m":15e-1},'
    //   printf '%s%s' "<hash 1>" "$E2" | sha256sum
    // (UTF-8 locale; the actor and payload are invented.)
    private const string KnownHash1 = "742bb6bc0ca9723b7081ae32c155f0d8668aa64ad06f89e085dce78bb6fb78ce";
    private const string KnownHash2 = "7cc3f0a3766cd49bd7b2ebf10a0ed7b4e5c8626fd60a22977081a82f2b733cb7";

    [Fact]
    public void Append_FixedEntries_MatchHashesComputedWithSha256sum()
    {
        var first = AuditChain.Append(null, _t0.AddTicks(1234567), "dm.invented", "transition",
            "{\"to\": \"preparation\", \"from\": \"normal\", \"rvr_m\": 550}");
        var second = AuditChain.Append(first, _t0.AddSeconds(1), "Zoë Invented", "tick",
            " { \"visibility_m\" : 1.50, \"note\": \"Zo\\u00eb: fog \\\"thick\\\"\" } ");

        Assert.Equal(1, first.Sequence);
        Assert.Equal(AuditChain.GenesisHash, first.PreviousHash);
        Assert.Equal(KnownHash1, first.Hash);
        Assert.Equal(2, second.Sequence);
        Assert.Equal(KnownHash1, second.PreviousHash);
        Assert.Equal(KnownHash2, second.Hash);
    }

    [Fact]
    public void PreparedEntries_OnAHead_MatchTheSameKnownHashes()
    {
        var first = AuditChain.Append(null, AuditChain.Prepare(_t0.AddTicks(1234567), "dm.invented", "transition",
            "{\"to\": \"preparation\", \"from\": \"normal\", \"rvr_m\": 550}"));
        var second = AuditChain.Append(new AuditChainHead(1, KnownHash1), AuditChain.Prepare(_t0.AddSeconds(1), "Zoë Invented", "tick",
            " { \"visibility_m\" : 1.50, \"note\": \"Zo\\u00eb: fog \\\"thick\\\"\" } "));

        Assert.Equal((1L, AuditChain.GenesisHash, KnownHash1), (first.Sequence, first.PreviousHash, first.Hash));
        Assert.Equal((2L, KnownHash1, KnownHash2), (second.Sequence, second.PreviousHash, second.Hash));
    }

    [Theory]
    [InlineData("", "tick", "{}")]
    [InlineData("engine", " ", "{}")]
    [InlineData("engine", "tick", "{\"a\":1,}")]
    [InlineData("engine", "tick", "[\"\\ud800\"]")]
    public void Prepare_RefusesABadEntry_BeforeAnyChain(string actor, string kind, string payload)
    {
        Assert.ThrowsAny<ArgumentException>(() => AuditChain.Prepare(_t0, actor, kind, payload));
    }

    [Fact]
    public void Append_OnAHeadWhoseHashIsNotAHash_IsRefused()
    {
        var pending = AuditChain.Prepare(_t0, "engine", "tick", "{}");

        Assert.Throws<ArgumentException>(() => AuditChain.Append(new AuditChainHead(3, "not-a-hash"), pending));
        Assert.Throws<ArgumentException>(() => AuditChain.Append(new AuditChainHead(3, KnownHash1.ToUpperInvariant()), pending));
    }

    [Fact]
    public void Append_KeepsThePayloadAsGiven_AndTheTimeAsUtc()
    {
        var entry = AuditChain.Append(null, new DateTimeOffset(2026, 1, 2, 5, 0, 0, TimeSpan.FromHours(2)), "engine", "transition", "{ \"a\": 1.0 }");

        Assert.Equal("{ \"a\": 1.0 }", entry.PayloadJson);
        Assert.Equal(TimeSpan.Zero, entry.Time.Offset);
        Assert.Equal(new DateTimeOffset(2026, 1, 2, 3, 0, 0, TimeSpan.Zero), entry.Time);
    }

    [Fact]
    public void Verify_GoodChain_IsOkAndCountsEntries()
    {
        var result = AuditChain.Verify(Chain(5));

        Assert.True(result.Ok);
        Assert.Equal(5, result.Entries);
        Assert.Null(result.FirstBadSequence);
        Assert.Null(result.Failure);
    }

    [Fact]
    public void Verify_EmptyChain_IsOk()
    {
        var result = AuditChain.Verify([]);

        Assert.True(result.Ok);
        Assert.Equal(0, result.Entries);
    }

    [Fact]
    public void Verify_PayloadByteChanged_NamesThatEntry()
    {
        var chain = Chain(5);
        chain[2] = chain[2] with { PayloadJson = chain[2].PayloadJson.Replace("\"n\":3", "\"n\":4", StringComparison.Ordinal) };

        var result = AuditChain.Verify(chain);

        Assert.False(result.Ok);
        Assert.Equal(3, result.FirstBadSequence);
        Assert.Equal(AuditFailure.HashMismatch, result.Failure);
        Assert.Equal(5, result.Entries);
    }

    [Fact]
    public void Verify_PayloadReformattedOnly_StillVerifies()
    {
        var chain = Chain(3);
        chain[1] = chain[1] with { PayloadJson = "{ \"note\" : \"invented\" , \"n\" : 2.000 }" };

        Assert.True(AuditChain.Verify(chain).Ok);
    }

    [Fact]
    public void Verify_EntryRemoved_NamesTheMissingSequence()
    {
        var chain = Chain(5);
        chain.RemoveAt(2);

        var result = AuditChain.Verify(chain);

        Assert.False(result.Ok);
        Assert.Equal(3, result.FirstBadSequence);
        Assert.Equal(AuditFailure.SequenceGap, result.Failure);
    }

    [Fact]
    public void Verify_EntriesSwapped_NamesTheFirstPosition()
    {
        var chain = Chain(5);
        (chain[2], chain[3]) = (chain[3], chain[2]);

        var result = AuditChain.Verify(chain);

        Assert.False(result.Ok);
        Assert.Equal(3, result.FirstBadSequence);
        Assert.Equal(AuditFailure.SequenceGap, result.Failure);
    }

    [Fact]
    public void Verify_ContentsSwappedButSequencesKept_IsCaught()
    {
        var chain = Chain(5);
        var third = chain[2];
        var fourth = chain[3];
        chain[2] = fourth with { Sequence = 3 };
        chain[3] = third with { Sequence = 4 };

        var result = AuditChain.Verify(chain);

        Assert.False(result.Ok);
        Assert.Equal(3, result.FirstBadSequence);
        Assert.Equal(AuditFailure.BrokenLink, result.Failure);
    }

    [Fact]
    public void Verify_EntryRewrittenWithFreshHash_BreaksTheNextLink()
    {
        var chain = Chain(5);
        var forged = AuditChain.Append(chain[1], chain[2].Time, chain[2].Actor, chain[2].Kind, "{\"n\":99}");
        chain[2] = forged;

        var result = AuditChain.Verify(chain);

        Assert.False(result.Ok);
        Assert.Equal(4, result.FirstBadSequence);
        Assert.Equal(AuditFailure.BrokenLink, result.Failure);
    }

    [Fact]
    public void Verify_DuplicatedEntry_IsCaught()
    {
        var chain = Chain(4);
        chain.Insert(2, chain[1]);

        var result = AuditChain.Verify(chain);

        Assert.False(result.Ok);
        Assert.Equal(2, result.FirstBadSequence);
        Assert.Equal(AuditFailure.SequenceDuplicate, result.Failure);
    }

    [Fact]
    public void Verify_FirstEntryNotSequenceOne_IsAGap()
    {
        var chain = Chain(3);
        chain.RemoveAt(0);

        var result = AuditChain.Verify(chain);

        Assert.Equal(1, result.FirstBadSequence);
        Assert.Equal(AuditFailure.SequenceGap, result.Failure);
    }

    [Fact]
    public void Verify_FirstEntryNotFromGenesis_IsABrokenLink()
    {
        var chain = Chain(2);
        chain[0] = chain[0] with { PreviousHash = new string('1', 64) };

        var result = AuditChain.Verify(chain);

        Assert.Equal(1, result.FirstBadSequence);
        Assert.Equal(AuditFailure.BrokenLink, result.Failure);
    }

    [Fact]
    public void Verify_UppercaseHash_IsMalformed()
    {
        var chain = Chain(2);
        chain[1] = chain[1] with { Hash = chain[1].Hash.ToUpperInvariant() };

        var result = AuditChain.Verify(chain);

        Assert.Equal(2, result.FirstBadSequence);
        Assert.Equal(AuditFailure.MalformedEntry, result.Failure);
    }

    [Fact]
    public void Verify_PayloadNoLongerJson_IsMalformed()
    {
        var chain = Chain(2);
        chain[1] = chain[1] with { PayloadJson = "{\"n\":2" };

        var result = AuditChain.Verify(chain);

        Assert.Equal(2, result.FirstBadSequence);
        Assert.Equal(AuditFailure.MalformedEntry, result.Failure);
    }

    [Fact]
    public void Verify_TimeChanged_IsAHashMismatch()
    {
        var chain = Chain(3);
        chain[1] = chain[1] with { Time = chain[1].Time.AddTicks(1) };

        var result = AuditChain.Verify(chain);

        Assert.Equal(2, result.FirstBadSequence);
        Assert.Equal(AuditFailure.HashMismatch, result.Failure);
    }

    [Fact]
    public void Verify_TimeGoingBackwards_IsReportedButNotAFailure()
    {
        var first = AuditChain.Append(null, _t0, "engine", "transition", "{}");
        var second = AuditChain.Append(first, _t0.AddSeconds(-2), "engine", "transition", "{}");
        var third = AuditChain.Append(second, _t0.AddSeconds(-3), "engine", "transition", "{}");

        var result = AuditChain.Verify([first, second, third]);

        Assert.True(result.Ok);
        Assert.Equal(2, result.FirstTimeRegressionSequence);
    }

    [Fact]
    public void Verifier_StreamingResult_EqualsTheWholeChainResult()
    {
        var chain = Chain(4);
        chain[3] = chain[3] with { Actor = "someone.else" };
        var verifier = new AuditChainVerifier();

        foreach (var entry in chain)
        {
            verifier.Observe(entry);
        }

        Assert.Equal(AuditChain.Verify(chain), verifier.Result);
        Assert.Equal(4, verifier.Result.FirstBadSequence);
    }

    private static List<AuditEntry> Chain(int count)
    {
        var chain = new List<AuditEntry>();
        AuditEntry? previous = null;
        for (var i = 1; i <= count; i++)
        {
            previous = AuditChain.Append(previous, _t0.AddSeconds(i), "engine", "transition", $"{{\"n\":{i},\"note\":\"invented\"}}");
            chain.Add(previous);
        }
        return chain;
    }
}
