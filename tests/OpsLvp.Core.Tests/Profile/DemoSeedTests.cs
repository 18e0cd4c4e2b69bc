using System.Globalization;
using System.Text.Json;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Profile;

// Checks on the invented demo data in seed-demo/ (all values there are invented and illustrative).
public sealed class DemoSeedTests
{
    private static readonly string SeedDir = Path.Combine(ProfileFixtures.RepoRoot(), "seed-demo");

    private static AerodromeProfile Demo() => ProfileValidator.LoadValidated(Path.Combine(SeedDir, "profile.json"));

    /// <summary>Tiny reader for the seed CSVs: comma-separated, no quoting (the seed files use none).</summary>
    private static (string[] Header, List<string[]> Rows) ReadCsv(string file)
    {
        var lines = File.ReadAllLines(Path.Combine(SeedDir, "scenarios", file)).Where(l => l.Length > 0).ToList();
        var header = lines[0].Split(',');
        var rows = lines.Skip(1).Select(l => l.Split(',')).ToList();
        Assert.All(rows, r => Assert.Equal(header.Length, r.Length));
        return (header, rows);
    }

    private static DateTimeOffset Time(string s) =>
        DateTimeOffset.ParseExact(s, "yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal);

    private static ReadingKind Kind(string snake) =>
        Enum.Parse<ReadingKind>(snake.Replace("_", "", StringComparison.Ordinal), ignoreCase: true);

    [Fact]
    public void DemoProfile_LoadsAndValidatesWithNoProblems()
    {
        var profile = Demo();
        Assert.Equal("XDMO", profile.Aerodrome.Id);
        Assert.True(profile.Aerodrome.Illustrative);
        // docs/engine.md R14: the demo confirms active -> cancellation (the recommended choice); its scripted duty manager confirms
        Assert.Equal([new TransitionRule(Phase.Active, Phase.Cancellation)], profile.Confirm);
        Assert.True(profile.InForceNeedsSafeguards);
    }

    [Fact]
    public void DemoProfile_HasTheShapeTheDemoNeeds()
    {
        var profile = Demo();
        Assert.Equal(3, profile.Runways.Count);
        Assert.Equal(2, profile.Runways.Count(r => r.Lvp));
        Assert.Equal(9, profile.Sensors.Count(s => s.Type is SensorType.RvrSystem or SensorType.Transmissometer or SensorType.ForwardScatter));
        Assert.Equal(2, profile.Sensors.Count(s => s.Type == SensorType.Ceilometer));
        Assert.All([profile.Checklists.Preparation, profile.Checklists.Active, profile.Checklists.Cancellation],
            items => Assert.InRange(items.Count, 4, 8));
    }

    [Fact]
    public void ConfirmProfile_EqualsTheDemoProfilePlusItsConfirmList()
    {
        var confirm = ProfileValidator.LoadValidated(Path.Combine(SeedDir, "profile-confirm.json"));
        // docs/engine.md R10, §5: the second demo profile needs confirmation of active.
        TransitionRule[] expected = [new(Phase.Normal, Phase.Active), new(Phase.Preparation, Phase.Active), new(Phase.Active, Phase.Cancellation)];
        Assert.Equal(expected, confirm.Confirm);
        var demoWithConfirm = Demo() with { Version = confirm.Version, Confirm = confirm.Confirm };
        Assert.Equal(ProfileLoader.Serialize(demoWithConfirm), ProfileLoader.Serialize(confirm));
        Assert.NotEqual(Demo().Version, confirm.Version);
    }

    [Fact]
    public void DemoReadings_HaveTheFixedHeaderKnownSensorsKindsAndStatuses()
    {
        var profile = Demo();
        var sensors = profile.Sensors.ToDictionary(s => s.Id);
        var (header, rows) = ReadCsv("demo-night.csv");
        Assert.Equal(["time", "sensor", "kind", "value", "status"], header);
        Assert.InRange(rows.Count, 10_000, 30_000);
        foreach (var r in rows)
        {
            Assert.True(sensors.TryGetValue(r[1], out var sensor), $"unknown sensor {r[1]}");
            Assert.Matches("^[a-z_]+$", r[2]);
            Assert.Contains(Kind(r[2]), SensorKinds.Produced(sensor!.Type));
            Assert.True(double.TryParse(r[3], NumberStyles.Float, CultureInfo.InvariantCulture, out var value) && double.IsFinite(value), r[3]);
            Assert.Contains(r[4], new[] { "ok", "degraded", "failed", "maintenance" });
        }
    }

    [Fact]
    public void DemoReadings_AreInTimeOrderPerSensorAndCoverTheNight()
    {
        var (_, rows) = ReadCsv("demo-night.csv");
        var times = rows.Select(r => Time(r[0])).ToList();
        Assert.Equal(Time("2026-01-15T18:00:00Z"), times[0]);
        Assert.InRange((times[^1] - times[0]).TotalHours, 6, 8);
        foreach (var group in rows.Select((r, i) => (Key: r[1] + "/" + r[2], Time: times[i])).GroupBy(x => x.Key))
        {
            var list = group.Select(x => x.Time).ToList();
            Assert.True(list.Zip(list.Skip(1)).All(p => p.Second > p.First), $"{group.Key} is not strictly increasing");
        }
    }

    [Fact]
    public void DemoReadings_GiveRvrFromRvrSystemsAndOnlyRawKindsFromComputingSensors()
    {
        var profile = Demo();
        var (_, rows) = ReadCsv("demo-night.csv");
        var kindsBySensor = rows.GroupBy(r => r[1]).ToDictionary(g => g.Key, g => g.Select(r => r[2]).ToHashSet());
        foreach (var s in profile.Sensors)
        {
            var expected = s.Type switch
            {
                SensorType.Transmissometer => new[] { "transmittance" },
                SensorType.ForwardScatter => ["extinction"],
                SensorType.RvrSystem => ["rvr"],
                SensorType.Ceilometer => ["cloud_base", "vertical_visibility"],
                SensorType.Visibility => ["visibility"],
                _ => ["background_luminance"],
            };
            Assert.Equal(expected.Order(), kindsBySensor[s.Id].Order());
        }
    }

    [Fact]
    public void DemoReadings_CrossBothThresholdsAndHaveASensorDropout()
    {
        var profile = Demo();
        var (_, rows) = ReadCsv("demo-night.csv");
        // RVR as the engine sees it: direct rvr rows plus the RVR derived from raw rows
        var derivation = new OpsLvp.Core.Optics.RvrDerivation(profile);
        var rvr = new List<double>();
        foreach (var r in rows.Where(r => r[4] == "ok"))
        {
            var reading = new OpsLvp.Core.Readings.Reading(Time(r[0]), r[1], Enum.GetValues<OpsLvp.Core.Readings.ReadingKind>().Single(k => OpsLvp.Core.Engine.Replay.ReadingsCsv.KindName(k) == r[2]), double.Parse(r[3], CultureInfo.InvariantCulture));
            if (r[2] == "rvr")
            {
                rvr.Add(reading.Value);
            }
            rvr.AddRange(derivation.Observe(reading).Select(d => d.Value));
        }
        Assert.Contains(rvr, v => v < profile.Thresholds.Active.RvrBelowM);
        Assert.Contains(rvr, v => v >= profile.Thresholds.Preparation.RvrRecoverM);
        var longestGap = rows.Where(r => r[2] is "rvr" or "extinction" or "transmittance").GroupBy(r => r[1])
            .Max(g => g.Select(r => Time(r[0])).Zip(g.Select(r => Time(r[0])).Skip(1)).Max(p => (p.Second - p.First).TotalMinutes));
        Assert.True(longestGap >= 15, $"longest RVR gap {longestGap} min");
    }

    [Fact]
    public void DemoActions_TickEveryMandatoryItemWithItsTeamByAMemberOfIt()
    {
        var profile = Demo();
        var items = profile.Checklists.Preparation.Concat(profile.Checklists.Active).Concat(profile.Checklists.Cancellation).ToDictionary(i => i.Id);
        using var users = JsonDocument.Parse(File.ReadAllText(Path.Combine(SeedDir, "users.json")));
        var teamsOf = users.RootElement.EnumerateArray().ToDictionary(
            u => u.GetProperty("name").GetString()!,
            u => u.GetProperty("teams").EnumerateArray().Select(t => t.GetString()!).ToHashSet());
        var (header, rows) = ReadCsv("demo-night.actions.csv");
        Assert.Equal(["time", "actor", "action", "target", "value", "reason"], header);
        // the scripted duty manager's confirmation of active -> cancellation (docs/engine.md R14)
        var confirm = Assert.Single(rows, r => r[2] == "confirm");
        Assert.Equal("duty_manager", users.RootElement.EnumerateArray().Single(u => u.GetProperty("name").GetString() == confirm[1]).GetProperty("role").GetString());
        rows = rows.Where(r => r != confirm).ToList();
        // the scripted field-lighting crew reports a fault and clears it, the duty manager acknowledges the downgrade (docs/capability.md)
        var facilities = profile.Capability!.Facilities.ToDictionary(f => f.Id);
        foreach (var r in rows.Where(r => r[2] == "facility"))
        {
            var team = r[4].Split(':')[1];
            Assert.Equal(facilities[r[3]].Team, team);
            Assert.Contains(team, teamsOf[r[1]]);
        }
        Assert.Equal(2, rows.Count(r => r[2] == "facility"));
        rows = rows.Where(r => r[2] is not ("facility" or "ack")).ToList();
        foreach (var r in rows)
        {
            Assert.Equal("tick", r[2]);
            Assert.True(items.TryGetValue(r[3], out var item), $"unknown item {r[3]}");
            Assert.Equal(item!.Team, r[4]);
            Assert.Contains(r[4], teamsOf[r[1]]);
        }
        Assert.Equal(items.Values.Where(i => i.Mandatory).Select(i => i.Id).Order(), rows.Select(r => r[3]).Where(id => items[id].Mandatory).Order());
        var times = rows.Select(r => Time(r[0])).ToList();
        Assert.True(times.Zip(times.Skip(1)).All(p => p.Second >= p.First));
    }

    [Fact]
    public void DemoUsers_HaveKnownRolesAndNoPasswords()
    {
        var text = File.ReadAllText(Path.Combine(SeedDir, "users.json"));
        Assert.DoesNotContain("password", text, StringComparison.OrdinalIgnoreCase);
        using var users = JsonDocument.Parse(text);
        var roles = users.RootElement.EnumerateArray().Select(u => u.GetProperty("role").GetString()).ToList();
        Assert.All(roles, r => Assert.Contains(r, new[] { "administrator", "duty_manager", "ground_staff", "viewer" }));
        Assert.Contains("duty_manager", roles);
    }

    [Fact]
    public void DemoMetar_IsXdmoInTimeOrder()
    {
        var lines = File.ReadAllLines(Path.Combine(SeedDir, "scenarios", "demo-night.metar")).Where(l => l.Length > 0).ToList();
        Assert.InRange(lines.Count, 25, 40);
        Assert.All(lines, l => Assert.Matches(@"^(METAR|SPECI) XDMO \d{6}Z ", l));
        Assert.Contains(lines, l => l.Contains(" FG ", StringComparison.Ordinal) && l.Contains(" VV00", StringComparison.Ordinal));
        var stamps = lines.Select(l => l.Split(' ')[2]).ToList();
        // Same night across midnight: day 15 then 16, so the ddhhmm stamps sort as strings.
        Assert.Equal(stamps.Order(StringComparer.Ordinal), stamps);
    }

    [Fact]
    public void DocsExample_ParsesAndValidates()
    {
        var md = File.ReadAllText(Path.Combine(ProfileFixtures.RepoRoot(), "docs", "profile.md"));
        var start = md.IndexOf("```json", StringComparison.Ordinal) + "```json".Length;
        var end = md.IndexOf("```", start, StringComparison.Ordinal);
        var profile = ProfileValidator.ParseValidated(md[start..end]);
        Assert.Equal("XDMO", profile.Aerodrome.Id);
    }

    /// <summary>max(Allard lights range, Koschmieder 2.996/σ) for σ per metre (docs/sources.md "Optics").</summary>
    private static double NightRvr(double sigmaPerM, double intensityCd)
    {
        const double NightThresholdLux = 8e-7; // ICAO Annex 3 Attachment D, night band (from memory, docs/sources.md)
        double lo = 1, hi = 200_000;
        for (var i = 0; i < 80; i++)
        {
            var mid = (lo + hi) / 2;
            if (intensityCd * Math.Exp(-sigmaPerM * mid) / (mid * mid) >= NightThresholdLux)
            {
                lo = mid;
            }
            else
            {
                hi = mid;
            }
        }
        return Math.Max(lo, 2.996 / sigmaPerM);
    }

    [Fact]
    public void DemoReadings_RawValuesGiveTheNightRvrThroughTheOptics()
    {
        // docs/sources.md worked check: MOR 300 m, I = 10 000 cd, night → lights range ≈ 954 m.
        Assert.Equal(954, NightRvr(2.996 / 300, 10_000), 0);
        var profile = Demo();
        var intensity = profile.Lights.IntensityCdByStep[profile.Lights.StepInUse];
        var baselines = profile.Sensors.Where(s => s.BaselineM is not null).ToDictionary(s => s.Id, s => s.BaselineM!.Value);
        var (_, rows) = ReadCsv("demo-night.csv");
        var checkedRows = 0;
        foreach (var raw in rows.Where(r => r[2] is "transmittance" or "extinction" && r[4] == "ok"))
        {
            var value = double.Parse(raw[3], CultureInfo.InvariantCulture);
            var sigma = raw[2] == "extinction" ? value / 1000 : -Math.Log(value) / baselines[raw[1]];
            var expected = NightRvr(sigma, intensity);
            var inputs = raw[2] == "extinction"
                ? new OpsLvp.Core.Optics.RvrInputs { Extinction = OpsLvp.Core.Units.ExtinctionCoefficient.FromPerKm(value), LightIntensity = new(intensity) }
                : new OpsLvp.Core.Optics.RvrInputs { Transmittance = value, Baseline = new(baselines[raw[1]]), LightIntensity = new(intensity) };
            // lum-main reads ~1.5 cd/m² all night (invented): the night band
            var computed = OpsLvp.Core.Optics.RvrCalculator.Calculate(inputs with { BackgroundLuminance = new(1.5) }).Rvr.Value;
            Assert.InRange(computed, expected * 0.99, expected * 1.01);
            checkedRows++;
        }
        Assert.True(checkedRows > 1000, $"only {checkedRows} raw rows");
    }
}
