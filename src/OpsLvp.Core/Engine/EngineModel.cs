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
    /// <summary>Maximum age used when the profile gives none for a kind (the RVR example of docs/engine.md R2).</summary>
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
            foreach (var sensor in Sensors.Values.Where(s => SensorKinds.GivesRvr(s.Type) && s.Runway == runway.Id))
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

        // Hot-path lookups, derived once so an evaluation allocates no keys and runs no LINQ over the profile.
        _maxAge = new TimeSpan[AllKinds.Length];
        foreach (var kind in AllKinds)
        {
            _maxAge[(int)kind] = ComputeMaxAge(kind);
        }
        _sensorMaxAge = Sensors.Values
            .Where(s => s.MaxAgeSeconds is > 0)
            .ToDictionary(s => s.Id, s => TimeSpan.FromSeconds(s.MaxAgeSeconds!.Value), StringComparer.Ordinal);
        _keys = new Dictionary<string, string[]>(StringComparer.Ordinal);
        foreach (var id in Sensors.Keys)
        {
            _keys[id] = AllKinds.Select(k => EngineState.SensorKey(id, k)).ToArray();
        }
        GoverningRvrKeys = Governing.Select(g => Key(g.SensorId, ReadingKind.Rvr)).ToArray();
        CeilingKinds = profile.VerticalVisibilityIsCeiling ? [ReadingKind.CloudBase, ReadingKind.VerticalVisibility] : [ReadingKind.CloudBase];
        CeilometerKeys = Ceilometers.Select(id => CeilingKinds.Select(k => Key(id, k)).ToArray()).ToArray();
        SensorEntries = Sensors.Values.Select(s => new SensorEntry(
            s,
            SensorKinds.Produced(s.Type).ToArray(),
            SensorKinds.Produced(s.Type).Select(k => Key(s.Id, k)).ToArray(),
            _keys[s.Id],
            MaxAge(s.Id, SensorKinds.Primary(s.Type)),
            AlarmKeys.SensorSilent(s.Id),
            $"sensor {s.Id} silent past its maximum age")).ToArray();
        SensorsById = SensorEntries.ToDictionary(e => e.Sensor.Id, StringComparer.Ordinal);
        _confirm = (profile.Confirm ?? []).Where(r => r is not null).Select(r => (r.From, r.To)).ToHashSet();
        _dwell = new TimeSpan[4];
        foreach (var kind in Enum.GetValues<ConditionKind>())
        {
            _dwell[(int)kind] = ComputeDwell(kind);
        }
        FutureSkew = TimeSpan.FromSeconds(Math.Max(0, profile.FutureSkewSeconds));
        MandatoryPreparationIds = ItemsOf(Phase.Preparation).Where(i => i is not null && i.Mandatory && !string.IsNullOrEmpty(i.Id)).Select(i => i.Id).Distinct().ToArray();
    }

    /// <summary>Ids of the profile's mandatory preparation items: the safeguards open before an episode starts (docs/engine.md R13).</summary>
    public IReadOnlyList<string> MandatoryPreparationIds { get; }

    /// <summary>Every defined reading kind, in declaration order.</summary>
    public static readonly ReadingKind[] AllKinds = Enum.GetValues<ReadingKind>();

    /// <summary>Every condition kind, in declaration order.</summary>
    public static readonly ConditionKind[] AllConditions = Enum.GetValues<ConditionKind>();

    private readonly TimeSpan[] _maxAge;
    private readonly Dictionary<string, TimeSpan> _sensorMaxAge;
    private readonly TimeSpan[] _dwell;
    private readonly Dictionary<string, string[]> _keys;
    private readonly HashSet<(Phase From, Phase To)> _confirm;

    /// <summary>One profile sensor with its derived keys and limits.</summary>
    internal sealed record SensorEntry(
        SensorConfig Sensor,
        ReadingKind[] KindsProduced,
        string[] ProducedKeys,
        string[] AllKeys,
        TimeSpan PrimaryMaxAge,
        string SilentAlarmKey,
        string SilentAlarmMessage);

    /// <summary>The <see cref="EngineState.Latest"/> key of each governing sensor's RVR, parallel to <see cref="Governing"/>.</summary>
    public IReadOnlyList<string> GoverningRvrKeys { get; }

    /// <summary>The kinds that count as ceiling (cloud base, and vertical visibility when the profile says so).</summary>
    public ReadingKind[] CeilingKinds { get; }

    /// <summary>The ceiling-kind keys of each ceilometer, parallel to <see cref="Ceilometers"/> and <see cref="CeilingKinds"/>.</summary>
    public IReadOnlyList<string[]> CeilometerKeys { get; }

    /// <summary>The profile's sensors in profile order, with derived keys.</summary>
    public IReadOnlyList<SensorEntry> SensorEntries { get; }

    public IReadOnlyDictionary<string, SensorEntry> SensorsById { get; }

    /// <summary>The profile sensor with this id; null for an unknown or missing id.</summary>
    public SensorConfig? SensorOf(string? sensorId) =>
        sensorId is not null && SensorsById.TryGetValue(sensorId, out var entry) ? entry.Sensor : null;

    /// <summary>The accepted future skew of reading times (negative profile values count as zero).</summary>
    public TimeSpan FutureSkew { get; }

    /// <summary>The <see cref="EngineState.Latest"/> key for a sensor and kind; cached for profile sensors.</summary>
    public string Key(string sensorId, ReadingKind kind) =>
        (uint)kind < (uint)AllKinds.Length && _keys.TryGetValue(sensorId, out var keys) ? keys[(int)kind] : EngineState.SensorKey(sensorId, kind);

    public AerodromeProfile Profile { get; }

    public IReadOnlyDictionary<string, SensorConfig> Sensors { get; }

    public IReadOnlyList<GoverningSensor> Governing { get; }

    public IReadOnlyList<(RunwayConfig Runway, string Direction)> LvpRunways { get; }

    public IReadOnlyList<string> Ceilometers { get; }

    public IReadOnlyDictionary<string, (Phase Phase, ChecklistItemConfig Item)> ItemConfigs { get; }

    public bool RvrConfigured => Governing.Count > 0;

    public bool CeilingConfigured => Ceilometers.Count > 0;

    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, (IReadOnlyList<GoverningSensor>, IReadOnlyList<string>)> _governingByDirections = new(StringComparer.Ordinal);

    /// <summary>The direction in use of <paramref name="runway"/> in <paramref name="state"/>: the duty manager's setting, else the profile's (docs/engine.md R34).</summary>
    public static string DirectionInUse(RunwayConfig runway, EngineState state) =>
        state.DirectionsInUse.Count > 0 && state.DirectionsInUse.TryGetValue(runway.Id, out var d) && runway.Directions.Contains(d) ? d : DirectionInUse(runway);

    /// <summary>The governing sensors and their RVR keys for the directions in use of <paramref name="state"/> (docs/engine.md R3, R34).</summary>
    public (IReadOnlyList<GoverningSensor> Sensors, IReadOnlyList<string> Keys) GoverningIn(EngineState state)
    {
        if (state.DirectionsInUse.Count == 0)
        {
            return (Governing, GoverningRvrKeys);
        }
        var signature = string.Join(";", LvpRunways.Select(x => DirectionInUse(x.Runway, state)));
        return _governingByDirections.GetOrAdd(signature, _ =>
        {
            var governing = new List<GoverningSensor>();
            foreach (var (runway, _) in LvpRunways)
            {
                var direction = DirectionInUse(runway, state);
                foreach (var sensor in Sensors.Values.Where(s => SensorKinds.GivesRvr(s.Type) && s.Runway == runway.Id))
                {
                    if (sensor.Sites is not null && sensor.Sites.TryGetValue(direction, out var position) && Profile.GoverningPositions.Contains(position))
                    {
                        governing.Add(new GoverningSensor(sensor.Id, runway.Id, direction, position));
                    }
                }
            }
            return (governing, governing.Select(g => Key(g.SensorId, ReadingKind.Rvr)).ToArray());
        });
    }

    public static string DirectionInUse(RunwayConfig runway) =>
        runway.DirectionInUse is { } d && runway.Directions.Contains(d) ? d : runway.Directions[0];

    public TimeSpan MaxAge(ReadingKind kind) =>
        (uint)kind < (uint)_maxAge.Length ? _maxAge[(int)kind] : ComputeMaxAge(kind);

    private TimeSpan ComputeMaxAge(ReadingKind kind) =>
        TimeSpan.FromSeconds(Profile.MaxAgeSeconds.TryGetValue(kind, out var s) && s > 0 ? s : DefaultMaxAgeSeconds);

    /// <summary>The maximum age of a sensor's readings of a kind: the sensor's own value when set, else the kind's (docs/engine.md R21).</summary>
    public TimeSpan MaxAge(string sensorId, ReadingKind kind) =>
        _sensorMaxAge.Count > 0 && sensorId is not null && _sensorMaxAge.TryGetValue(sensorId, out var own) ? own : MaxAge(kind);

    /// <summary>Fresh from the reading's time until (exclusive) time + its sensor's or kind's maximum age (docs/engine.md R2, R21).</summary>
    public bool IsFresh(Reading reading, DateTimeOffset t) => t < reading.Time + MaxAge(reading.SensorId, reading.Kind);

    public IReadOnlyList<ChecklistItemConfig> ItemsOf(Phase phase) => phase switch
    {
        Phase.Preparation => Profile.Checklists.Preparation,
        Phase.Active => Profile.Checklists.Active,
        Phase.Cancellation => Profile.Checklists.Cancellation,
        _ => [],
    };

    /// <summary>The dwell of a condition (docs/engine.md R7); negative profile values count as zero.</summary>
    public TimeSpan Dwell(ConditionKind kind) =>
        (uint)kind < (uint)_dwell.Length ? _dwell[(int)kind] : ComputeDwell(kind);

    private TimeSpan ComputeDwell(ConditionKind kind)
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

    public bool NeedsConfirmation(Phase from, Phase to) => _confirm.Contains((from, to));

    private static IEnumerable<(Phase Phase, ChecklistItemConfig Item)> AllItems(ChecklistSet set) =>
        set.Preparation.Select(i => (Phase: Phase.Preparation, Item: i))
            .Concat(set.Active.Select(i => (Phase: Phase.Active, Item: i)))
            .Concat(set.Cancellation.Select(i => (Phase: Phase.Cancellation, Item: i)))
            .Where(x => x.Item is not null && !string.IsNullOrEmpty(x.Item.Id));
}
