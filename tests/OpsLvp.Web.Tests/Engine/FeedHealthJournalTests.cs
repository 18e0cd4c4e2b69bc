using System.Text.Json;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;

namespace OpsLvp.Web.Tests.Engine;

/// <summary>Feed-health audit entries debounced per feed, counts carried (issue 12: 13 758 entries in 261 s). Feed names are invented.</summary>
public sealed class FeedHealthJournalTests
{
    private static readonly DateTimeOffset T0 = new(2026, 1, 15, 3, 0, 0, TimeSpan.Zero);
    private static readonly TimeSpan Interval = TimeSpan.FromMinutes(1);

    private static FeedHealth Health(FeedStatus status, string name = "push:station-a") =>
        new(name, "push", status, null, T0, T0, 0, null, null, 0, 0, 0, 0, 0, null);

    private static List<FeedHealthJournal.Proposal> Observe(FeedHealthJournal journal, FeedStatus status, TimeSpan at) =>
        journal.Observe([Health(status)], T0 + at, T0 + at);

    private static JsonElement Payload(FeedHealthJournal.Proposal p) => JsonDocument.Parse(p.Entry.PayloadJson).RootElement;

    [Fact]
    public void AFirstChange_IsRecordedAtOnce()
    {
        var journal = new FeedHealthJournal(Interval);
        Assert.Empty(Observe(journal, FeedStatus.Ok, TimeSpan.Zero));

        var due = Assert.Single(Observe(journal, FeedStatus.Degraded, TimeSpan.FromSeconds(1)));

        Assert.Equal("feed_degraded", due.Entry.Kind);
        Assert.Equal("ok", Payload(due).GetProperty("from").GetString());
        Assert.Equal("degraded", Payload(due).GetProperty("to").GetString());
        Assert.Equal(1, Payload(due).GetProperty("changes").GetInt32());
    }

    [Fact]
    public void Flapping_WritesOneEntryPerInterval_CarryingEveryChange()
    {
        var journal = new FeedHealthJournal(Interval);
        Observe(journal, FeedStatus.Ok, TimeSpan.Zero);
        var first = Observe(journal, FeedStatus.Degraded, TimeSpan.FromSeconds(1));
        journal.Recorded(first, T0 + TimeSpan.FromSeconds(1));

        var written = new List<FeedHealthJournal.Proposal>();
        for (var i = 0; i < 100; i++)
        {
            // 100 changes in 50 s, all inside the interval
            var due = Observe(journal, i % 2 == 0 ? FeedStatus.Ok : FeedStatus.Degraded, TimeSpan.FromSeconds(1.5 + (i * 0.5)));
            written.AddRange(due);
            journal.Recorded(due, T0 + TimeSpan.FromSeconds(1.5 + (i * 0.5)));
        }
        Assert.Empty(written);

        var carried = Assert.Single(Observe(journal, FeedStatus.Degraded, TimeSpan.FromSeconds(62)));

        // Ends where it was last recorded (degraded): a flap, with all 100 changes counted.
        Assert.Equal("feed_flapped", carried.Entry.Kind);
        Assert.Equal(100, Payload(carried).GetProperty("changes").GetInt32());
        Assert.Equal(50, Payload(carried).GetProperty("toOk").GetInt32());
        Assert.Equal(50, Payload(carried).GetProperty("toDegraded").GetInt32());
    }

    [Fact]
    public void AChangeInsideTheInterval_IsWrittenWhenTheIntervalIsUp_EvenWithoutAnotherChange()
    {
        var journal = new FeedHealthJournal(Interval);
        Observe(journal, FeedStatus.Ok, TimeSpan.Zero);
        journal.Recorded(Observe(journal, FeedStatus.Degraded, TimeSpan.FromSeconds(1)), T0 + TimeSpan.FromSeconds(1));
        Assert.Empty(Observe(journal, FeedStatus.Down, TimeSpan.FromSeconds(10)));

        var due = Assert.Single(Observe(journal, FeedStatus.Down, TimeSpan.FromSeconds(61)));

        Assert.Equal("feed_lost", due.Entry.Kind);
        Assert.Equal("degraded", Payload(due).GetProperty("from").GetString());
        Assert.Equal(1, Payload(due).GetProperty("changes").GetInt32());
    }

    [Fact]
    public void AnEntryWhoseCommitFailed_IsProposedAgain_WithItsCounts()
    {
        var journal = new FeedHealthJournal(Interval);
        Observe(journal, FeedStatus.Ok, TimeSpan.Zero);
        Assert.Single(Observe(journal, FeedStatus.Down, TimeSpan.FromSeconds(1))); // not recorded: the commit failed

        var again = Assert.Single(Observe(journal, FeedStatus.Down, TimeSpan.FromSeconds(2)));

        Assert.Equal("feed_lost", again.Entry.Kind);
        Assert.Equal(1, Payload(again).GetProperty("changes").GetInt32());
    }

    [Fact]
    public void FeedsAreDebouncedSeparately()
    {
        var journal = new FeedHealthJournal(Interval);
        journal.Observe([Health(FeedStatus.Ok, "a"), Health(FeedStatus.Ok, "b")], T0, T0);
        journal.Recorded(journal.Observe([Health(FeedStatus.Down, "a"), Health(FeedStatus.Ok, "b")], T0, T0), T0);

        var due = journal.Observe([Health(FeedStatus.Down, "a"), Health(FeedStatus.Down, "b")], T0.AddSeconds(1), T0.AddSeconds(1));

        Assert.Equal("b", Assert.Single(due).Feed);
    }
}
