using OpsLvp.FaultCases;
using OpsLvp.Web.Tests.Infrastructure;
using Xunit.Abstractions;

namespace OpsLvp.Web.Tests.Faults;

/// <summary>
/// The data folder's filesystem stops under the running server process as after a fatal I/O error (docs/reliability.md
/// "Storage faults": the read-only/SIGBUS hunt), once with the WAL index pages dirty and once written back first. The
/// same cycle as the fault runner's <c>--fs-shutdown</c>. Readings are invented.
/// </summary>
public sealed class FilesystemShutdownTests(ITestOutputHelper output)
{
    [LoopFact]
    public async Task FilesystemShutDown_TheServerSurvives_Refuses_SaysFailing_AndLosesNothingAcknowledged()
    {
        LoopFactAttribute.EnsureCanMount();
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var tally = new FaultTally();

            await ShutdownRun.RunAsync(2, folder, tally, output.WriteLine);

            output.WriteLine(tally.ToMarkdown());
            Assert.True(tally.Broken == 0, string.Join("\n", tally.Examples));
            Assert.Equal(4, tally.TriedIn(StorageRun.Group));
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }
}
