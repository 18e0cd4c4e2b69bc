using System.Text.Json;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Profile;

/// <summary>
/// Checks an <see cref="AerodromeProfile"/> before any engine uses it (docs/engine.md R6). Every problem is listed,
/// each naming its field as a JSON path (<c>thresholds.active.rvrRecoverM</c>, <c>sensors[3].runway</c>) and
/// saying what is expected. The rules are written out in docs/profile.md.
/// </summary>
public static class ProfileValidator
{
    private static readonly double MaxReportableRvrM = Reporting.RvrReporting.UpperLimit.Value;

    private static readonly double CeilingLimitFt = Metar.MetarReport.CeilingLimit.Value;

    /// <summary>The transitions docs/engine.md R8 defines; only these can be set to need confirmation (R10).</summary>
    public static IReadOnlyList<TransitionRule> LegalTransitions { get; } =
    [
        new(Phase.Normal, Phase.Preparation),
        new(Phase.Normal, Phase.Active),
        new(Phase.Preparation, Phase.Active),
        new(Phase.Preparation, Phase.Normal),
        new(Phase.Active, Phase.Cancellation),
        new(Phase.Cancellation, Phase.Active),
        new(Phase.Cancellation, Phase.Normal),
        new(Phase.Cancellation, Phase.Preparation),
    ];

    /// <summary>Lists every problem of <paramref name="profile"/>; an empty list means it is usable.</summary>
    public static ValidationResult Validate(AerodromeProfile profile)
    {
        ArgumentNullException.ThrowIfNull(profile);
        var problems = new List<ValidationProblem>();
        var check = new Checker(problems);

        check.NotBlank("version", profile.Version);
        CheckAerodrome(check, profile.Aerodrome);
        var runways = CheckRunways(check, profile.Runways);
        CheckSensors(check, profile.Sensors, runways);
        var teams = CheckTeams(check, profile.Teams);
        CheckLights(check, profile.Lights, profile.Sensors);
        CheckMaxAges(check, profile.MaxAgeSeconds, profile.Sensors);
        CheckGoverningPositions(check, profile.GoverningPositions);
        if (profile.FutureSkewSeconds < 0)
        {
            check.Add("futureSkewSeconds", $"is {profile.FutureSkewSeconds}; expected 0 or more seconds");
        }
        if (profile.TabletIdleSignOutMinutes is < 1 or > 240)
        {
            check.Add("tabletIdleSignOutMinutes", $"is {profile.TabletIdleSignOutMinutes}; expected 1 to 240 minutes");
        }
        CheckThresholds(check, profile.Thresholds, profile, runways);
        CheckConfirm(check, profile.Confirm);
        CheckChecklists(check, profile.Checklists, teams);
        problems.AddRange(ForecastSettingsValidator.Validate(profile.Forecast));
        problems.AddRange(Capability.CapabilityValidator.Validate(profile.Capability, profile));
        return new ValidationResult(problems);
    }

    /// <summary>Parses and validates; throws <see cref="ProfileException"/> listing every problem.</summary>
    public static AerodromeProfile ParseValidated(string json) => ThrowIfInvalid(ProfileLoader.Parse(json));

    /// <summary>Loads and validates a file; throws <see cref="ProfileException"/> listing every problem.</summary>
    public static AerodromeProfile LoadValidated(string path) => ThrowIfInvalid(ProfileLoader.Load(path));

    private static AerodromeProfile ThrowIfInvalid(AerodromeProfile profile)
    {
        var result = Validate(profile);
        return result.IsValid ? profile : throw new ProfileException(result.Problems);
    }

    private static void CheckAerodrome(Checker check, AerodromeInfo? aerodrome)
    {
        if (aerodrome is null)
        {
            check.Add("aerodrome", "is missing; expected an object with id, name and timeZone");
            return;
        }
        if (check.NotBlank("aerodrome.id", aerodrome.Id)
            && !(aerodrome.Id.Length == 4 && aerodrome.Id.All(c => c is >= 'A' and <= 'Z')))
        {
            check.Add("aerodrome.id", $"'{aerodrome.Id}' is not a location indicator; expected four capital letters A–Z");
        }
        check.NotBlank("aerodrome.name", aerodrome.Name);
        if (check.NotBlank("aerodrome.timeZone", aerodrome.TimeZone)
            && !TimeZoneInfo.TryFindSystemTimeZoneById(aerodrome.TimeZone, out _))
        {
            check.Add("aerodrome.timeZone", $"'{aerodrome.TimeZone}' is not a known time zone; expected an IANA zone id such as 'UTC' or 'Europe/Lisbon'");
        }
    }

    private static Dictionary<string, RunwayConfig> CheckRunways(Checker check, IReadOnlyList<RunwayConfig> runways)
    {
        var byId = new Dictionary<string, RunwayConfig>(StringComparer.Ordinal);
        for (var i = 0; i < runways.Count; i++)
        {
            var path = $"runways[{i}]";
            var runway = runways[i];
            if (check.NotBlank($"{path}.id", runway.Id) && !byId.TryAdd(runway.Id, runway))
            {
                check.Add($"{path}.id", $"duplicate runway id '{runway.Id}'; expected each runway id once");
            }
            if (runway.Directions.Count == 0)
            {
                check.Add($"{path}.directions", "is empty; expected the runway's designators, e.g. [\"07L\", \"25R\"]");
            }
            var seen = new HashSet<string>(StringComparer.Ordinal);
            for (var d = 0; d < runway.Directions.Count; d++)
            {
                if (check.NotBlank($"{path}.directions[{d}]", runway.Directions[d]) && !seen.Add(runway.Directions[d]))
                {
                    check.Add($"{path}.directions[{d}]", $"duplicate direction '{runway.Directions[d]}'; expected each direction once");
                }
            }
            if (runway.DirectionInUse is not null && !runway.Directions.Contains(runway.DirectionInUse))
            {
                check.Add($"{path}.directionInUse", $"'{runway.DirectionInUse}' is not a direction of runway '{runway.Id}'; expected one of {List(runway.Directions)}");
            }
        }
        return byId;
    }

    private static void CheckSensors(
        Checker check, IReadOnlyList<SensorConfig> sensors, Dictionary<string, RunwayConfig> runways)
    {
        var byId = new Dictionary<string, SensorConfig>(StringComparer.Ordinal);
        for (var i = 0; i < sensors.Count; i++)
        {
            if (check.NotBlank($"sensors[{i}].id", sensors[i].Id) && !byId.TryAdd(sensors[i].Id, sensors[i]))
            {
                check.Add($"sensors[{i}].id", $"duplicate sensor id '{sensors[i].Id}'; expected each sensor id once");
            }
        }
        for (var i = 0; i < sensors.Count; i++)
        {
            var path = $"sensors[{i}]";
            var sensor = sensors[i];
            var type = Name(sensor.Type);
            if (SensorKinds.GivesRvr(sensor.Type))
            {
                CheckRvrPlacement(check, path, sensor, runways);
            }
            else
            {
                if (sensor.Runway is not null)
                {
                    check.Add($"{path}.runway", $"is set on a {type} sensor; only RVR sensors (rvrSystem, transmissometer, forwardScatter) stand on a runway");
                }
                if (sensor.Sites is not null)
                {
                    check.Add($"{path}.sites", $"is set on a {type} sensor; only RVR sensors have RVR sites");
                }
            }
            if (sensor.Type == SensorType.Transmissometer)
            {
                if (sensor.BaselineM is not { } baseline)
                {
                    check.Add($"{path}.baselineM", "is missing; a transmissometer needs its baseline in metres (> 0)");
                }
                else if (!(double.IsFinite(baseline) && baseline > 0))
                {
                    check.Add($"{path}.baselineM", $"is {baseline}; expected a baseline in metres > 0");
                }
            }
            else if (sensor.BaselineM is not null)
            {
                check.Add($"{path}.baselineM", $"is set on a {type} sensor; only transmissometers have a baseline");
            }
            if (sensor.MaxAgeSeconds is { } ownAge && ownAge <= 0)
            {
                check.Add($"{path}.maxAgeSeconds", $"is {ownAge}; expected this sensor's maximum reading age in seconds > 0, or no value to use the per-kind maxAgeSeconds");
            }
            if (sensor.LuminanceSensor is not null)
            {
                if (sensor.Type is not (SensorType.Transmissometer or SensorType.ForwardScatter))
                {
                    check.Add($"{path}.luminanceSensor", $"is set on a {type} sensor; only transmissometer and forwardScatter sensors compute RVR from luminance");
                }
                else if (!byId.TryGetValue(sensor.LuminanceSensor, out var lum) || lum.Type != SensorType.Luminance)
                {
                    check.Add($"{path}.luminanceSensor", $"'{sensor.LuminanceSensor}' is not a luminance sensor of this profile; expected the id of a sensor of type luminance");
                }
            }
        }
    }

    private static void CheckRvrPlacement(Checker check, string path, SensorConfig sensor, Dictionary<string, RunwayConfig> runways)
    {
        RunwayConfig? runway = null;
        if (string.IsNullOrWhiteSpace(sensor.Runway))
        {
            check.Add($"{path}.runway", "is missing; an RVR sensor needs the id of the runway it stands on");
        }
        else if (!runways.TryGetValue(sensor.Runway, out runway))
        {
            check.Add($"{path}.runway", $"unknown runway '{sensor.Runway}'; expected one of {List(runways.Keys)}");
        }
        if (sensor.Sites is null || sensor.Sites.Count == 0)
        {
            check.Add($"{path}.sites", "is missing; an RVR sensor needs direction → position (tdz, mid, end) for each runway direction");
            return;
        }
        if (runway is null)
        {
            return;
        }
        foreach (var direction in sensor.Sites.Keys)
        {
            if (!runway.Directions.Contains(direction))
            {
                check.Add($"{path}.sites.{direction}", $"runway '{runway.Id}' has no direction '{direction}'; expected one of {List(runway.Directions)}");
            }
        }
    }

    private static HashSet<string> CheckTeams(Checker check, IReadOnlyList<TeamConfig> teams)
    {
        var ids = new HashSet<string>(StringComparer.Ordinal);
        for (var i = 0; i < teams.Count; i++)
        {
            if (check.NotBlank($"teams[{i}].id", teams[i].Id) && !ids.Add(teams[i].Id))
            {
                check.Add($"teams[{i}].id", $"duplicate team id '{teams[i].Id}'; expected each team id once");
            }
            check.NotBlank($"teams[{i}].name", teams[i].Name);
        }
        return ids;
    }

    private static void CheckLights(Checker check, LightsConfig lights, IReadOnlyList<SensorConfig> sensors)
    {
        foreach (var (step, cd) in lights.IntensityCdByStep)
        {
            if (!(double.IsFinite(cd) && cd > 0))
            {
                check.Add($"lights.intensityCdByStep.{step}", $"is {cd}; expected a light intensity in candela > 0");
            }
        }
        var computesRvr = sensors.Any(s => s.Type is SensorType.Transmissometer or SensorType.ForwardScatter);
        if (!lights.IntensityCdByStep.ContainsKey(lights.StepInUse) && (computesRvr || lights.IntensityCdByStep.Count > 0))
        {
            check.Add("lights.stepInUse", $"step {lights.StepInUse} has no intensity in lights.intensityCdByStep; expected one of {List(lights.IntensityCdByStep.Keys.Order().Select(k => k.ToString(System.Globalization.CultureInfo.InvariantCulture)))}");
        }
    }

    private static void CheckMaxAges(Checker check, IReadOnlyDictionary<ReadingKind, int> maxAges, IReadOnlyList<SensorConfig> sensors)
    {
        foreach (var (kind, seconds) in maxAges)
        {
            if (seconds <= 0)
            {
                check.Add($"maxAgeSeconds.{Name(kind)}", $"is {seconds}; expected a maximum reading age in seconds > 0");
            }
        }
        // A sensor with its own maxAgeSeconds needs no per-kind value (docs/engine.md R21).
        var perKind = sensors.Where(s => s.MaxAgeSeconds is null).ToList();
        var produced = perKind.SelectMany(s => SensorKinds.Produced(s.Type)).Distinct().Order();
        foreach (var kind in produced)
        {
            if (!maxAges.ContainsKey(kind))
            {
                var who = perKind.First(s => SensorKinds.Produced(s.Type).Contains(kind));
                check.Add($"maxAgeSeconds.{Name(kind)}", $"is missing; sensor '{who.Id}' ({Name(who.Type)}) produces {Name(kind)} readings, so a maximum age in seconds > 0 is needed (docs/engine.md R2)");
            }
        }
    }

    private static void CheckGoverningPositions(Checker check, IReadOnlyList<RvrPosition> positions)
    {
        if (positions.Count == 0)
        {
            check.Add("governingPositions", "is empty; expected at least one of tdz, mid, end");
        }
        for (var i = 0; i < positions.Count; i++)
        {
            if (positions.Take(i).Contains(positions[i]))
            {
                check.Add($"governingPositions[{i}]", $"duplicate position '{Name(positions[i])}'; expected each position once");
            }
        }
    }

    private static void CheckThresholds(Checker check, ThresholdSet? thresholds, AerodromeProfile profile, Dictionary<string, RunwayConfig> runways)
    {
        if (thresholds is null || thresholds.Preparation is null || thresholds.Active is null)
        {
            check.Add(thresholds is null ? "thresholds" : thresholds.Preparation is null ? "thresholds.preparation" : "thresholds.active",
                "is missing; expected preparation and active thresholds");
            return;
        }
        var prep = thresholds.Preparation;
        var active = thresholds.Active;
        CheckPhase(check, "thresholds.preparation", prep);
        CheckPhase(check, "thresholds.active", active);

        // Both phases grade the same inputs: an input only one phase watches would skip a phase or never relax it.
        CheckSameInputs(check, "rvrBelowM", prep.RvrBelowM, active.RvrBelowM);
        CheckSameInputs(check, "ceilingBelowFt", prep.CeilingBelowFt, active.CeilingBelowFt);

        CheckAbove(check, "rvrBelowM", prep.RvrBelowM, active.RvrBelowM, "m");
        CheckAbove(check, "rvrRecoverM", prep.RvrRecoverM, active.RvrRecoverM, "m");
        CheckAbove(check, "ceilingBelowFt", prep.CeilingBelowFt, active.CeilingBelowFt, "ft");
        CheckAbove(check, "ceilingRecoverFt", prep.CeilingRecoverFt, active.CeilingRecoverFt, "ft");

        var usesRvr = prep.RvrBelowM is not null || active.RvrBelowM is not null;
        var usesCeiling = prep.CeilingBelowFt is not null || active.CeilingBelowFt is not null;
        if (!usesRvr && !usesCeiling)
        {
            check.Add("thresholds.active", "configures neither RVR nor ceiling; expected rvrBelowM/rvrRecoverM or ceilingBelowFt/ceilingRecoverFt");
        }

        var lvpRunways = runways.Values.Where(r => r.Lvp).Select(r => r.Id).ToHashSet(StringComparer.Ordinal);
        var governingRvr = profile.Sensors.Any(s => SensorKinds.GivesRvr(s.Type) && s.Runway is not null && lvpRunways.Contains(s.Runway)
            && s.Sites is not null && s.Sites.Values.Any(p => profile.GoverningPositions.Contains(p)));
        if (usesRvr && !governingRvr)
        {
            check.Add("thresholds.active.rvrBelowM", "RVR thresholds are set but no RVR sensor stands at a governing position of a runway listed for LVP; expected such a sensor, or no RVR thresholds");
        }
        var hasCeilometer = profile.Sensors.Any(s => s.Type == SensorType.Ceilometer);
        if (usesCeiling && !hasCeilometer)
        {
            check.Add("thresholds.active.ceilingBelowFt", "ceiling thresholds are set but no ceilometer is configured, so the ceiling would stay unknown and LVP could never relax; expected a ceilometer sensor, or no ceiling thresholds");
        }
    }

    private static void CheckPhase(Checker check, string path, PhaseThresholds phase)
    {
        CheckPair(check, path, "rvrBelowM", phase.RvrBelowM, "rvrRecoverM", phase.RvrRecoverM, "m");
        CheckPair(check, path, "ceilingBelowFt", phase.CeilingBelowFt, "ceilingRecoverFt", phase.CeilingRecoverFt, "ft");
        if (!Enum.IsDefined(phase.EntryComparison))
        {
            check.Add($"{path}.entryComparison", $"is {(int)phase.EntryComparison}; expected below or atOrBelow");
        }
        else if (phase.EntryComparison == EntryComparison.AtOrBelow)
        {
            // At or below: a value equal to both the entry and the recovery threshold would meet both (docs/engine.md R18).
            CheckRecoverAboveEntry(check, path, "rvrBelowM", phase.RvrBelowM, "rvrRecoverM", phase.RvrRecoverM, "m");
            CheckRecoverAboveEntry(check, path, "ceilingBelowFt", phase.CeilingBelowFt, "ceilingRecoverFt", phase.CeilingRecoverFt, "ft");
        }
        // Thresholds no input can reach (docs/engine.md R23): RVR is reported up to 2000 m (ICAO Annex 3, App 3,
        // §4.3.6; WMO BUFR code table 0 08 014), and a ceiling is a layer below 20 000 ft (ICAO/EASA definition).
        foreach (var (name, value) in new[] { ("rvrBelowM", phase.RvrBelowM), ("rvrRecoverM", phase.RvrRecoverM) })
        {
            if (value is { } v && double.IsFinite(v) && v > MaxReportableRvrM)
            {
                check.Add($"{path}.{name}", $"is {v} m, above the highest reportable RVR ({MaxReportableRvrM} m, reported as P2000), so no RVR reading can reach it; expected at most {MaxReportableRvrM} m");
            }
        }
        foreach (var (name, value) in new[] { ("ceilingBelowFt", phase.CeilingBelowFt), ("ceilingRecoverFt", phase.CeilingRecoverFt) })
        {
            if (value is { } v && double.IsFinite(v) && v >= CeilingLimitFt)
            {
                check.Add($"{path}.{name}", $"is {v} ft, at or above the ceiling definition's limit ({CeilingLimitFt} ft: a ceiling is a BKN/OVC layer below it), so no ceiling can reach it; expected less than {CeilingLimitFt} ft");
            }
        }
        if (phase.EnterDwellSeconds < 0)
        {
            check.Add($"{path}.enterDwellSeconds", $"is {phase.EnterDwellSeconds}; expected 0 or more seconds");
        }
        if (phase.RecoverDwellSeconds <= 0)
        {
            check.Add($"{path}.recoverDwellSeconds", $"is {phase.RecoverDwellSeconds}; expected more than 0 seconds, so a single good reading cannot relax the phase (docs/engine.md R7)");
        }
    }

    private static void CheckPair(Checker check, string path, string belowName, double? below, string recoverName, double? recover, string unit)
    {
        var belowOk = CheckPositive(check, $"{path}.{belowName}", below, unit);
        var recoverOk = CheckPositive(check, $"{path}.{recoverName}", recover, unit);
        if (below is not null && recover is null)
        {
            check.Add($"{path}.{recoverName}", $"is missing while {belowName} is set; expected a recovery value ≥ {belowName} ({below} {unit})");
        }
        else if (below is null && recover is not null)
        {
            check.Add($"{path}.{belowName}", $"is missing while {recoverName} is set; expected an entry value ≤ {recoverName} ({recover} {unit})");
        }
        else if (belowOk && recoverOk && recover < below)
        {
            // Equal is allowed: entry is strict (< below) and recovery inclusive (≥ recover), so no value meets both,
            // and the recover dwell (> 0) still keeps the phase from flapping.
            check.Add($"{path}.{recoverName}", $"is {recover} {unit}, below {belowName} ({below} {unit}); expected a recovery value ≥ {belowName}");
        }
    }

    private static void CheckRecoverAboveEntry(Checker check, string path, string belowName, double? below, string recoverName, double? recover, string unit)
    {
        if (below is { } b && recover is { } r && double.IsFinite(b) && double.IsFinite(r) && r == b)
        {
            check.Add($"{path}.{recoverName}", $"is {r} {unit}, equal to {belowName} with entryComparison atOrBelow, so {r} {unit} would both enter and recover; expected a recovery value > {belowName}");
        }
    }

    private static bool CheckPositive(Checker check, string path, double? value, string unit)
    {
        if (value is { } v && !(double.IsFinite(v) && v > 0))
        {
            check.Add(path, $"is {v}; expected a value in {unit} > 0");
            return false;
        }
        return value is not null;
    }

    private static void CheckSameInputs(Checker check, string name, double? prep, double? active)
    {
        if (prep is null && active is not null)
        {
            check.Add($"thresholds.preparation.{name}", $"is missing while thresholds.active.{name} is set; expected both phases to grade the same inputs");
        }
        else if (prep is not null && active is null)
        {
            check.Add($"thresholds.active.{name}", $"is missing while thresholds.preparation.{name} is set; expected both phases to grade the same inputs");
        }
    }

    private static void CheckAbove(Checker check, string name, double? prep, double? active, string unit)
    {
        if (prep is { } p && active is { } a && double.IsFinite(p) && double.IsFinite(a) && p <= a)
        {
            check.Add($"thresholds.preparation.{name}", $"is {p} {unit}, not above thresholds.active.{name} ({a} {unit}); expected preparation to act on better conditions than active (> {a} {unit})");
        }
    }

    private static void CheckConfirm(Checker check, IReadOnlyList<TransitionRule> confirm)
    {
        for (var i = 0; i < confirm.Count; i++)
        {
            var rule = confirm[i];
            if (!LegalTransitions.Contains(rule))
            {
                check.Add($"confirm[{i}]", $"{Name(rule.From)} → {Name(rule.To)} is not a transition of docs/engine.md R8; expected one of {List(LegalTransitions.Select(t => $"{Name(t.From)}→{Name(t.To)}"))}");
            }
            else if (confirm.Take(i).Contains(rule))
            {
                check.Add($"confirm[{i}]", $"duplicate rule {Name(rule.From)} → {Name(rule.To)}; expected each transition once");
            }
        }
        var normalToActive = confirm.ToList().FindIndex(r => r == new TransitionRule(Phase.Normal, Phase.Active));
        if (normalToActive >= 0 && !confirm.Contains(new TransitionRule(Phase.Preparation, Phase.Active)))
        {
            check.Add($"confirm[{normalToActive}]", "normal → active needs confirmation but preparation → active does not; expected both, since entering active from normal passes through preparation (docs/engine.md R13, R14)");
        }
    }

    private static void CheckChecklists(Checker check, ChecklistSet? checklists, HashSet<string> teams)
    {
        if (checklists is null)
        {
            check.Add("checklists", "is missing; expected preparation, active and cancellation item lists");
            return;
        }
        var ids = new Dictionary<string, string>(StringComparer.Ordinal);
        CheckItems(check, "checklists.preparation", checklists.Preparation, teams, ids);
        CheckItems(check, "checklists.active", checklists.Active, teams, ids);
        CheckItems(check, "checklists.cancellation", checklists.Cancellation, teams, ids);
        CheckAfter(check, "checklists.preparation", checklists.Preparation);
        CheckAfter(check, "checklists.active", checklists.Active);
        CheckAfter(check, "checklists.cancellation", checklists.Cancellation);
    }

    /// <summary>Prerequisites (docs/engine.md R16) name other items of the same checklist and form no cycle.</summary>
    private static void CheckAfter(Checker check, string path, IReadOnlyList<ChecklistItemConfig> items)
    {
        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var i = 0; i < items.Count; i++)
        {
            if (items[i] is { Id: { Length: > 0 } id })
            {
                index.TryAdd(id, i);
            }
        }
        for (var i = 0; i < items.Count; i++)
        {
            if (items[i]?.After is not { } after)
            {
                continue;
            }
            for (var j = 0; j < after.Count; j++)
            {
                var field = $"{path}[{i}].after[{j}]";
                if (string.IsNullOrWhiteSpace(after[j]))
                {
                    check.Add(field, "is blank; expected the id of another item of the same checklist");
                }
                else if (after[j] == items[i].Id)
                {
                    check.Add(field, $"item '{after[j]}' names itself; expected another item of the same checklist");
                }
                else if (!index.ContainsKey(after[j]))
                {
                    check.Add(field, $"unknown item '{after[j]}'; expected one of {List(index.Keys.Where(k => k != items[i].Id))}");
                }
            }
        }
        // a cycle: depth-first search over the references that resolved
        var state = new int[items.Count];
        bool Cycle(int i, List<string> trail)
        {
            state[i] = 1;
            trail.Add(items[i].Id);
            foreach (var next in items[i].After ?? [])
            {
                if (next is null || next == items[i].Id || !index.TryGetValue(next, out var j))
                {
                    continue;
                }
                if (state[j] == 1)
                {
                    trail.Add(next);
                    return true;
                }
                if (state[j] == 0 && Cycle(j, trail))
                {
                    return true;
                }
            }
            trail.RemoveAt(trail.Count - 1);
            state[i] = 2;
            return false;
        }
        for (var i = 0; i < items.Count; i++)
        {
            var trail = new List<string>();
            if (items[i] is not null && state[i] == 0 && items[i].After is { Count: > 0 } && Cycle(i, trail))
            {
                check.Add($"{path}[{i}].after", $"prerequisites form a cycle ({string.Join(" → ", trail)}); expected an order that can be completed");
                return;
            }
        }
    }

    private static void CheckItems(Checker check, string path, IReadOnlyList<ChecklistItemConfig> items, HashSet<string> teams, Dictionary<string, string> ids)
    {
        for (var i = 0; i < items.Count; i++)
        {
            var itemPath = $"{path}[{i}]";
            var item = items[i];
            if (check.NotBlank($"{itemPath}.id", item.Id) && !ids.TryAdd(item.Id, itemPath))
            {
                check.Add($"{itemPath}.id", $"duplicate item id '{item.Id}' (also {ids[item.Id]}); expected ids unique across all checklists");
            }
            check.NotBlank($"{itemPath}.text", item.Text);
            if (check.NotBlank($"{itemPath}.team", item.Team) && !teams.Contains(item.Team))
            {
                check.Add($"{itemPath}.team", $"unknown team '{item.Team}'; expected one of {List(teams)}");
            }
            if (item.DueWithinMinutes <= 0)
            {
                check.Add($"{itemPath}.dueWithinMinutes", $"is {item.DueWithinMinutes}; expected more than 0 minutes after phase entry");
            }
        }
    }

    private static string Name<T>(T value) where T : struct, Enum => JsonNamingPolicy.CamelCase.ConvertName(value.ToString());

    private static string List(IEnumerable<string> values)
    {
        var list = values.ToList();
        return list.Count == 0 ? "(none configured)" : string.Join(", ", list.Select(v => $"'{v}'"));
    }

    private sealed class Checker(List<ValidationProblem> problems)
    {
        public void Add(string field, string message) => problems.Add(new ValidationProblem(field, message));

        /// <summary>Adds a problem when blank; true when the value is present.</summary>
        public bool NotBlank(string field, string? value)
        {
            if (string.IsNullOrWhiteSpace(value))
            {
                Add(field, "is blank; expected a non-empty text");
                return false;
            }
            return true;
        }
    }
}
