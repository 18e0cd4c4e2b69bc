using OpsLvp.Cli;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Review;

namespace OpsLvp.Core.Tests.Review;

/// <summary>What-if replays and the CLI's --episode / --export options, on the invented demo night.</summary>
public sealed class WhatIfTests
{
    private static readonly ReviewFixtures Night = ReviewFixtures.DemoNight;

    [Fact]
    public void WhatIf_SameProfile_HasNoDifference()
    {
        var export = Night.Export();

        var result = WhatIf.Run(export, export.Profile);

        Assert.Equal(TimeSpan.Zero, result.ActiveDifference);
        Assert.Equal(0, result.TransitionDifference);
        Assert.Equal(result.Actual.Select(t => (t.At, t.To)), result.Alternative.Select(t => (t.At, t.To)));
        // Active 21:42:06 → 00:44:00 in the recorded night, cancellation confirmed by the scripted duty manager (seed-demo/README.md).
        Assert.Equal(new TimeSpan(3, 1, 54), result.ActualActive);
    }

    [Fact]
    public void WhatIf_HigherActiveThreshold_GivesMoreTimeInForce()
    {
        var export = Night.Export();
        var t = export.Profile.Thresholds;
        // Invented alternative: enter active below 800 m, recover at 900 m (demo profile: 550 / 650 m, invented).
        var edited = WhatIf.WithThresholds(export.Profile, t with { Active = t.Active with { RvrBelowM = 800, RvrRecoverM = 900 } });

        var result = WhatIf.Run(export, edited);

        Assert.True(result.ActiveDifference > TimeSpan.Zero, $"difference {result.ActiveDifference}");
        Assert.True(result.Alternative.First(a => a.To == Phase.Active).At < result.Actual.First(a => a.To == Phase.Active).At);
        Assert.Equal(550, export.Profile.Thresholds.Active.RvrBelowM);
    }

    [Fact]
    public void WithThresholds_Invalid_NamesTheProblem()
    {
        var p = Night.Profile;
        var t = p.Thresholds;

        var ex = Assert.Throws<ProfileException>(() => WhatIf.WithThresholds(p, t with { Active = t.Active with { RvrBelowM = 700, RvrRecoverM = 600 } }));

        Assert.Contains("thresholds.active", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void WhatIf_EqualsTheCliReplayOfTheExportWithTheSameEditedProfile()
    {
        var export = Night.Export();
        var t = export.Profile.Thresholds;
        var edited = WhatIf.WithThresholds(export.Profile, t with { Preparation = t.Preparation with { EnterDwellSeconds = 600 } });
        var dir = Directory.CreateTempSubdirectory("opslvp-whatif-");
        try
        {
            var exportPath = Path.Combine(dir.FullName, "episode.json");
            var profilePath = Path.Combine(dir.FullName, "edited.json");
            File.WriteAllText(exportPath, export.ToJson());
            File.WriteAllText(profilePath, ProfileLoader.Serialize(edited));

            var (code, output, err) = Run("replay", "--episode", exportPath, "--profile", profilePath);

            Assert.Equal((0, ""), (code, err));
            var whatIf = WhatIf.Run(export, edited);
            Assert.Equal(whatIf.AlternativeEvents.Select(e => e.Json), output.Split('\n', StringSplitOptions.RemoveEmptyEntries));
            Assert.NotEqual(whatIf.Actual.Select(a => a.At), whatIf.Alternative.Select(a => a.At));
        }
        finally
        {
            dir.Delete(recursive: true);
        }
    }

    [Fact]
    public void CliReplayEpisode_WithItsOwnProfile_PrintsTheRecordedTransitions()
    {
        var dir = Directory.CreateTempSubdirectory("opslvp-episode-");
        try
        {
            var exportPath = Path.Combine(dir.FullName, "episode.json");
            File.WriteAllText(exportPath, Night.Export().ToJson());

            var (code, output, _) = Run("replay", "--episode", exportPath);

            Assert.Equal(0, code);
            var transitions = output.Split('\n', StringSplitOptions.RemoveEmptyEntries).Where(l => l.StartsWith("{\"event\":\"transition\"", StringComparison.Ordinal)).ToList();
            Assert.Equal(Night.Events.Where(e => e.Name == "transition").Select(e => e.Json), transitions);
        }
        finally
        {
            dir.Delete(recursive: true);
        }
    }

    [Fact]
    public void CliReplayEpisode_WithReadingsToo_IsAUsageError()
    {
        var (code, _, err) = Run("replay", "--episode", "e.json", "--readings", "r.csv");
        Assert.Equal(2, code);
        Assert.Contains("only --profile may be added", err, StringComparison.Ordinal);
    }

    [Fact]
    public void CliAuditVerifyExport_TamperedEntry_ExitsThreeNamingTheSequence()
    {
        var export = Night.Export();
        var target = export.Audit[5];
        var tampered = export with { Audit = export.Audit.Select(a => a.Sequence == target.Sequence ? a with { Actor = a.Actor + "x" } : a).ToList() };
        var dir = Directory.CreateTempSubdirectory("opslvp-verify-");
        try
        {
            var good = Path.Combine(dir.FullName, "good.json");
            var bad = Path.Combine(dir.FullName, "bad.json");
            File.WriteAllText(good, export.ToJson());
            File.WriteAllText(bad, tampered.ToJson());

            var ok = Run("audit", "verify", "--export", good);
            var broken = Run("audit", "verify", "--export", bad);

            Assert.Equal(0, ok.Code);
            Assert.Contains("\"ok\":true", ok.Out, StringComparison.Ordinal);
            Assert.Equal(3, broken.Code);
            Assert.Contains($"\"first_bad_sequence\":{target.Sequence},\"reason\":\"hash_mismatch\"", broken.Out, StringComparison.Ordinal);
        }
        finally
        {
            dir.Delete(recursive: true);
        }
    }

    [Fact]
    public void CliAuditVerifyExport_NotAnExport_ExitsOneWithTheReason()
    {
        var file = Path.GetTempFileName();
        File.WriteAllText(file, "{\"format\":\"x\"}");
        try
        {
            var (code, _, err) = Run("audit", "verify", "--export", file);
            Assert.Equal(1, code);
            Assert.Contains("not an episode export", err, StringComparison.Ordinal);
        }
        finally
        {
            File.Delete(file);
        }
    }

    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }
}
