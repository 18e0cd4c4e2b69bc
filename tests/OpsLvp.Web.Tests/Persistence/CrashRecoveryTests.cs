using System.Diagnostics;
using System.Globalization;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

public class CrashRecoveryTests
{
    [Fact]
    public async Task WriterKilledAtRandomMoments_LosesNoCommittedEntry_AndStateMatchesTheChain()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();
        var random = new Random(20261201);
        var reported = new List<long>();

        for (var round = 0; round < 4; round++)
        {
            reported.AddRange(await RunAndKillAsync(temp.FilePath, killAfterLines: random.Next(3, 40)));
        }

        using var store = new AuditStore(temp.Factory);
        var verification = await store.VerifyAsync();
        var head = await store.GetHeadAsync();
        var state = await store.GetLatestStateAsync();
        Assert.True(verification.Ok, verification.Detail);
        Assert.NotNull(head);
        // Every sequence the writer saw committed is there, exactly once (verification rules out gaps and repeats).
        Assert.Equal(reported.Count, reported.Distinct().Count());
        Assert.True(head.Sequence >= reported.Max());
        Assert.Equal(head.Sequence, verification.Entries);
        // State and chain were committed together: the state names the head and carries its payload.
        Assert.Equal(head.Sequence, state!.AuditSequence);
        Assert.Equal(head.PayloadJson, state.StateJson);
    }

    private static async Task<List<long>> RunAndKillAsync(string dbPath, int killAfterLines)
    {
        var assembly = typeof(CrashWriterProgram).Assembly.Location;
        var start = new ProcessStartInfo("dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var arg in new[] { "exec", assembly, "crash-writer", dbPath })
        {
            start.ArgumentList.Add(arg);
        }
        using var child = Process.Start(start)!;
        var lines = new List<long>();
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        try
        {
            while (lines.Count < killAfterLines)
            {
                var line = await child.StandardOutput.ReadLineAsync(timeout.Token);
                if (line is null)
                {
                    Assert.Fail("crash writer ended early: " + await child.StandardError.ReadToEndAsync(timeout.Token));
                }
                lines.Add(long.Parse(line, CultureInfo.InvariantCulture));
            }
        }
        finally
        {
            // Process.Kill is SIGKILL on Linux: no finaliser, no flush, no rollback by the writer.
            child.Kill(entireProcessTree: true);
            await child.WaitForExitAsync(CancellationToken.None);
        }
        return lines;
    }
}
