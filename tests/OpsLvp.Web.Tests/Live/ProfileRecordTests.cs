using OpsLvp.Core.Profile;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Live;

/// <summary>
/// The engine puts the whole profile on record (a <c>profile_loaded</c> audit entry) at its first start and whenever it
/// starts with a profile other than the one last recorded, so the review can judge old episodes by their own thresholds.
/// </summary>
public sealed class ProfileRecordTests
{
    [Fact]
    public async Task FirstStart_RecordsTheProfile_ARestartOnTheSameOneDoesNot_AChangedOneIsRecordedAgain()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var path = LiveTestProfile.Write(folder, activeEnterDwellSeconds: 0);
            await using (var first = OpsLvpApp.Start(LiveTestProfile.Settings(path), folder))
            {
                var entry = Assert.Single(await LiveClient.EntriesAsync(first), e => e.Kind == ProfileRecord.Kind);
                var recorded = ProfileRecord.ProfileOf(entry);
                Assert.NotNull(recorded);
                Assert.Equal(ProfileLoader.Serialize(ProfileValidator.LoadValidated(path)), ProfileLoader.Serialize(recorded));
                Assert.Equal(ProfileRecord.Sha256(recorded), ProfileRecord.ShaOf(entry));
            }
            await using (var second = OpsLvpApp.Start(LiveTestProfile.Settings(path), folder))
            {
                var entries = await LiveClient.EntriesAsync(second);
                Assert.Equal(2, entries.Count(e => e.Kind == "engine_started"));
                Assert.Single(entries, e => e.Kind == ProfileRecord.Kind);
            }

            // Same version string, different content (an invented longer dwell): recorded again.
            LiveTestProfile.Write(folder, activeEnterDwellSeconds: 45);
            await using var third = OpsLvpApp.Start(LiveTestProfile.Settings(path), folder);
            var records = (await LiveClient.EntriesAsync(third)).Where(e => e.Kind == ProfileRecord.Kind).ToList();
            Assert.Equal(2, records.Count);
            Assert.Equal(0, ProfileRecord.ProfileOf(records[0])!.Thresholds.Active.EnterDwellSeconds);
            Assert.Equal(45, ProfileRecord.ProfileOf(records[1])!.Thresholds.Active.EnterDwellSeconds);
            await LiveClient.AssertChainVerifiesAsync(third);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public void AnEntryThatIsNotAReadableProfileRecord_GivesNoProfile()
    {
        Assert.Null(ProfileRecord.ProfileOf(Entry("engine_started", "{}")));
        Assert.Null(ProfileRecord.ProfileOf(Entry(ProfileRecord.Kind, "{\"version\":\"x\"}")));
        Assert.Null(ProfileRecord.ProfileOf(Entry(ProfileRecord.Kind, "{\"profile\":{\"version\":\"x\"}}")));
        Assert.Null(ProfileRecord.ProfileOf(Entry(ProfileRecord.Kind, "[1]")));
        Assert.Null(ProfileRecord.ShaOf(Entry(ProfileRecord.Kind, "[1]")));
        Assert.Null(ProfileRecord.ShaOf(Entry(ProfileRecord.Kind, "{\"sha256\":5}")));
    }

    private static Core.Audit.AuditEntry Entry(string kind, string payload) =>
        Core.Audit.AuditChain.Append(null, DateTimeOffset.UnixEpoch, "engine", kind, payload);
}
