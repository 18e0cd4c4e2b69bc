using OpsLvp.FaultCases;
using OpsLvp.Web.Tests.Infrastructure;
using Xunit.Abstractions;

namespace OpsLvp.Web.Tests.Faults;

/// <summary>
/// The short versions of the fault runner (tests/OpsLvp.Faults, docs/reliability.md "Fault runs") with the same case
/// generators and checks: 10 kill -9 of the real server process under load, 10 000 generated hostile ingest bodies. The
/// disk-full cycle is <see cref="Engine.DiskFullTests"/>. Readings are invented.
/// </summary>
public sealed class FaultSuiteShortTests(ITestOutputHelper output)
{
    [Fact]
    public async Task TenKillsUnderLoad_LoseNoAcknowledgedReading_KeepTheChainWithoutReusedSequences_AndRestoreTheState()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var tally = new FaultTally();
            var (checkedReadings, lost) = await KillRun.RunAsync(10, folder, seed: 7, tally, output.WriteLine);

            output.WriteLine(tally.ToMarkdown());
            Assert.True(tally.Broken == 0, string.Join("\n", tally.Examples));
            Assert.Equal(0, lost);
            Assert.True(checkedReadings > 0, "no reading was acknowledged: the kills checked nothing");
            // per kill: readings and chain; per start after a kill: the restored state
            Assert.Equal(10 + 10 + 9, tally.TriedIn(KillRun.Group));
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task TenThousandHostileBodies_AreEachAnswered4xxWithAReasonOrACorrect202_Never5xx_AndTheServerStaysUp()
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var profile = FaultProfile.Write(folder);
            using var server = await ServerProcess.StartAsync(folder, profile);
            var tally = new FaultTally();

            await HostileRun.RunAsync(server.Client, 10_000, seed: 12, parallel: 4, tally, () => server.ExitDescription, output.WriteLine);

            output.WriteLine(tally.ToMarkdown());
            Assert.True(tally.Broken == 0, string.Join("\n", tally.Examples));
            Assert.Equal(10_000 + 11, tally.TriedIn(HostileRun.Group)); // the bodies, and the alive check every 1 000 and at the end
            Assert.False(server.HasExited);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }
}
