using CsCheck;
using Microsoft.Extensions.Logging.Abstractions;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// <see cref="LiveState"/> with several nodes (docs/deployment.md "Fan-out and commands between nodes"): own snapshots
/// only while leading, the leader's while not, a newer epoch first and then a newer version winning.
/// </summary>
public sealed class LiveStateLeadershipTests
{
    private static LiveSnapshot Snapshot(long version) => new(
        version, DateTimeOffset.UnixEpoch, new AerodromeView("XTST", "Test Field (invented)", "UTC", "t", true),
        null!, [], [], [], [], null);

    [Fact]
    public void Standby_DoesNotShowItsOwnEngine_ShowsTheLeaders_AndLeading_ShowsItsOwn()
    {
        var leadership = new SwitchableLeadership("b", leader: false, epoch: 0);
        var live = new LiveState(NullLogger<LiveState>.Instance, null, leadership);
        var sent = new List<long>();
        live.PublishedOwn += (s, _) => sent.Add(s.Version);

        live.Publish(Snapshot(100));
        Assert.Null(live.Current);
        Assert.Equal(100, live.OwnLatest?.Version);

        Assert.True(live.ApplyRemote(Snapshot(50), epoch: 7));
        Assert.Equal(50, live.Current?.Version);

        leadership.Set(true, epoch: 8);
        Assert.False(live.ApplyRemote(Snapshot(60), epoch: 7)); // while leading, nothing from elsewhere
        live.Publish(Snapshot(10)); // own engine, newer epoch: shown although its version is lower
        Assert.Equal(10, live.Current?.Version);
        Assert.Equal([10L], sent);
    }

    [Fact]
    public void OlderEpoch_NeverOverwritesNewer_AndNotLiveMark_YieldsToTheNextSnapshot()
    {
        var live = new LiveState(NullLogger<LiveState>.Instance, null, new SwitchableLeadership("b", leader: false, epoch: 0));
        Assert.True(live.ApplyRemote(Snapshot(1_000), epoch: 5));
        Assert.False(live.ApplyRemote(Snapshot(9_000), epoch: 4)); // an old leader late on the channel
        Assert.False(live.ApplyRemote(Snapshot(1_000), epoch: 5)); // not newer
        live.MarkNotLive(Snapshot(1_000) with { Recording = new RecordingView(false, DateTimeOffset.UnixEpoch, "test", "NOT LIVE") }, 5);
        Assert.Equal("NOT LIVE", live.Current?.Recording?.Headline);
        Assert.True(live.ApplyRemote(Snapshot(1_001), epoch: 5));
        Assert.Null(live.Current?.Recording);
    }

    [Fact]
    public void WhateverTheOrderOfArrival_TheStandbyShowsTheNewestEpochThenVersion()
    {
        Gen.Select(Gen.Long[0, 5], Gen.Long[1, 50]).Array[1, 30].Sample(offers =>
        {
            var live = new LiveState(NullLogger<LiveState>.Instance, null, new SwitchableLeadership("b", leader: false, epoch: 0));
            foreach (var (epoch, version) in offers)
            {
                live.ApplyRemote(Snapshot(version), epoch);
            }
            var newest = offers.Max();
            return live.CurrentEpoch == newest.Item1 && live.Current?.Version == newest.Item2;
        });
    }
}
