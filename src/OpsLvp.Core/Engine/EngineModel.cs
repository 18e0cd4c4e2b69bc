using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine;

/// <summary>A governing RVR sensor: the LVP runway it stands on and its position for the direction in use.</summary>
internal sealed record GoverningSensor(string SensorId, string RunwayId, string Direction, RvrPosition Position)
{
    /// <summary>How reasons name it, e.g. "07 TDZ".</summary>
    public string Label => $"{Direction} {Position.ToString().ToUpperInvariant()}";
}

/// <summary>What the engine derives once from a profile. Tolerates profiles the validator would refuse (never throws).</summary>
internal sealed class EngineModel
{
    /// <summary>Maximum age used when the profile gives none for a kind (the RVR example of DESIGN R2).</summary>
    public const int DefaultMaxAgeSeconds = 120;

    public EngineModel(AerodromeProfile profile)
    {
        Profile = profile;
        Sensors = profile.Sensors
            .Where(s => s is not null && !string.IsNullOrEmpty(s.Id))
            .GroupBy(s => s.Id, StringComparer.Ordinal)
            .ToDictionary(g => g.Key, g => g.First(), StringComparer.Ordinal);
        var governing = new List<GoverningSensor>();
        var runwayPositions = new List<(RunwayConfig Runway, string Direction)>();
        foreach (var runway in profile.Runways.Where(r => r is not null && r.Lvp && r.Directions is { Count: > 0 }))
        {
            var direction = DirectionInUse(runway);
            runwayPositions.Add((runway, direction));
            foreach (var sensor in Sensors.Values.Where(s => ReadingScreen.GivesRvr(s.Type) && s.Runway == runway.Id))
            {
                if (sensor.Sites is not null && sensor.Sites.TryGetValue(direction, out var position)
                    && profile.GoverningPositions.Contains(position))
                {
                    governing.Add(new GoverningSensor(sensor.Id, runway.Id, direction, position));
                }
            }
        }
        Governing = governing;
        LvpRunways = runwayPositions;
        Ceilometers = Sensors.Values.Where(s => s.Type == SensorType.Ceilometer).Select(s => s.Id).ToList();
        ItemConfigs = AllItems(profile.Checklists)
            .GroupBy(x => x.Item.Id, StringComparer.Ordinal)
            .ToDictionary(g => g.Key, g => g.First(), StringComparer.Ordinal);
    }

    public AerodromeProfile Profile { get; }

    public IReadOnlyDictionary<string, SensorConfig> Sensors { get; }

    public IReadOnlyList<GoverningSensor> Governing { get; }

    public IReadOnlyList<(RunwayConfig Runway, string Direction)> LvpRunways { get; }

    public IReadOnlyList<string> Ceilometers { get; }

    public IReadOnlyDictionary<string, (Phase Phase, ChecklistItemConfig Item)> ItemConfigs { get; }

    public bool RvrConfigured => Governing.Count > 0;

    public bool CeilingConfigured => Ceilometers.Count > 0;

    public static string DirectionInUse(RunwayConfig runway) =>
        runway.DirectionInUse is { } d && runway.Directions.Contains(d) ? d : runway.Directions[0];

    public TimeSpan MaxAge(ReadingKind kind) =>
        TimeSpan.FromSeconds(Profile.MaxAgeSeconds.TryGetValue(kind, out var s) && s > 0 ? s : DefaultMaxAgeSeconds);

    /// <summary>Fresh from the reading's time until (exclusive) time + the kind's maximum age (DESIGN R2).</summary>
    public bool IsFresh(Reading reading, DateTimeOffset t) => t < reading.Time + MaxAge(reading.Kind);

    public IReadOnlyList<ChecklistItemConfig> ItemsOf(Phase phase) => phase switch
    {
        Phase.Preparation => Profile.Checklists.Preparation,
        Phase.Active => Profile.Checklists.Active,
        Phase.Cancellation => Profile.Checklists.Cancellation,
        _ => [],
    };

    /// <summary>The dwell of a condition (DESIGN R7); negative profile values count as zero.</summary>
    public TimeSpan Dwell(ConditionKind kind)
    {
        var t = Profile.Thresholds;
        var seconds = kind switch
        {
            ConditionKind.Active => t.Active.EnterDwellSeconds,
            ConditionKind.Preparation => t.Preparation.EnterDwellSeconds,
            ConditionKind.RecoveryFromActive => t.Active.RecoverDwellSeconds,
            _ => t.Preparation.RecoverDwellSeconds,
        };
        return TimeSpan.FromSeconds(Math.Max(0, seconds));
    }

    public bool NeedsConfirmation(Phase from, Phase to) => Profile.Confirm.Any(r => r is not null && r.From == from && r.To == to);

    private static IEnumerable<(Phase Phase, ChecklistItemConfig Item)> AllItems(ChecklistSet set) =>
        set.Preparation.Select(i => (Phase: Phase.Preparation, Item: i))
            .Concat(set.Active.Select(i => (Phase: Phase.Active, Item: i)))
            .Concat(set.Cancellation.Select(i => (Phase: Phase.Cancellation, Item: i)))
            .Where(x => x.Item is not null && !string.IsNullOrEmpty(x.Item.Id));
}
