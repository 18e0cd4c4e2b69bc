using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Capability;

/// <summary>Checks the optional profile section <c>capability</c> (docs/capability.md, docs/engine.md R30); each problem names its field.</summary>
public static class CapabilityValidator
{
    /// <summary>The highest reportable RVR, metres (ICAO Annex 3 App 3 §4.3.6): a higher minimum could never be met.</summary>
    private static readonly double MaxRvrM = Reporting.RvrReporting.UpperLimit.Value;

    /// <summary>Every problem of <paramref name="capability"/> against the rest of <paramref name="profile"/> (none when the section is absent).</summary>
    public static IReadOnlyList<ValidationProblem> Validate(CapabilityProfile? capability, AerodromeProfile profile)
    {
        ArgumentNullException.ThrowIfNull(profile);
        var problems = new List<ValidationProblem>();
        if (capability is null)
        {
            return problems;
        }
        void Add(string field, string message) => problems.Add(new ValidationProblem(field, message));
        var directions = new HashSet<string>(profile.Runways.Where(r => r?.Directions is not null).SelectMany(r => r.Directions), StringComparer.Ordinal);
        var teams = new HashSet<string>(profile.Teams.Where(t => t is not null).Select(t => t.Id), StringComparer.Ordinal);
        var sensors = new HashSet<string>(profile.Sensors.Where(s => s is not null).Select(s => s.Id), StringComparer.Ordinal);
        if (capability.ObserverRvrMaxAgeSeconds <= 0)
        {
            Add("capability.observerRvrMaxAgeSeconds", $"is {capability.ObserverRvrMaxAgeSeconds}; expected seconds > 0");
        }
        var ids = new HashSet<string>(StringComparer.Ordinal);
        for (var i = 0; i < capability.Facilities.Count; i++)
        {
            var f = capability.Facilities[i];
            var at = $"capability.facilities[{i}]";
            if (f is null)
            {
                Add(at, "is null; expected a facility");
                continue;
            }
            if (string.IsNullOrWhiteSpace(f.Id))
            {
                Add($"{at}.id", "is blank; expected a unique facility id");
            }
            else if (!ids.Add(f.Id))
            {
                Add($"{at}.id", $"'{f.Id}' is used twice; facility ids must be unique");
            }
            if (string.IsNullOrWhiteSpace(f.Name))
            {
                Add($"{at}.name", "is blank; expected the name people call it");
            }
            if (f.Directions is null || f.Directions.Count == 0)
            {
                Add($"{at}.directions", "is empty; expected the runway directions it serves");
            }
            else
            {
                foreach (var d in f.Directions.Where(d => d is null || !directions.Contains(d)))
                {
                    Add($"{at}.directions", $"names unknown runway direction '{d}'; expected one of {string.Join(", ", directions)}");
                }
            }
            if (!teams.Contains(f.Team ?? ""))
            {
                Add($"{at}.team", $"'{f.Team}' is not a team of the profile; expected one of {string.Join(", ", teams)}");
            }
            if (f.Kind == FacilityKind.Ils && f.IlsCategory is null or OperationKind.Lvto)
            {
                Add($"{at}.ilsCategory", "is missing; expected the ILS category (catI, catII or catIII)");
            }
            if (f.Kind != FacilityKind.Ils && f.IlsCategory is not null)
            {
                Add($"{at}.ilsCategory", "is set on a facility that is not an ILS");
            }
            if (f.Kind == FacilityKind.StandbyPower && f.SwitchOverSeconds is not ({ } s and >= 0 and < 3600))
            {
                Add($"{at}.switchOverSeconds", $"is {f.SwitchOverSeconds?.ToString(System.Globalization.CultureInfo.InvariantCulture) ?? "missing"}; expected the standby power switch-over time in seconds (0 or more, below 3600)");
            }
            if (f.Kind == FacilityKind.RvrSensor && !sensors.Contains(f.Sensor ?? ""))
            {
                Add($"{at}.sensor", $"'{f.Sensor}' is not a sensor of the profile; an RVR sensor facility names its sensor");
            }
        }
        var offered = new HashSet<(string, OperationKind)>();
        for (var i = 0; i < capability.Operations.Count; i++)
        {
            var op = capability.Operations[i];
            var at = $"capability.operations[{i}]";
            if (op is null)
            {
                Add(at, "is null; expected an operation");
                continue;
            }
            if (op.Direction is null || !directions.Contains(op.Direction))
            {
                Add($"{at}.direction", $"'{op.Direction}' is not a runway direction of the profile");
            }
            else if (!offered.Add((op.Direction, op.Kind)))
            {
                Add($"{at}.kind", $"{op.Kind} is offered twice on {op.Direction}");
            }
            var needed = op.Facilities ?? [];
            foreach (var id in needed.Where(id => id is null || !ids.Contains(id)))
            {
                Add($"{at}.facilities", $"names unknown facility '{id}'");
            }
            foreach (var id in (op.AcceptDegraded ?? []).Where(id => !needed.Contains(id)))
            {
                Add($"{at}.acceptDegraded", $"names '{id}', which is not one of this operation's facilities");
            }
            var seen = new HashSet<RvrPosition>();
            var rvr = op.Rvr ?? [];
            for (var j = 0; j < rvr.Count; j++)
            {
                var need = rvr[j];
                if (need is null)
                {
                    Add($"{at}.rvr[{j}]", "is null; expected a position and minimumM");
                    continue;
                }
                if (!seen.Add(need.Position))
                {
                    Add($"{at}.rvr[{j}].position", $"{need.Position} is listed twice");
                }
                if (!(need.MinimumM > 0 && need.MinimumM <= MaxRvrM))
                {
                    Add($"{at}.rvr[{j}].minimumM", $"is {need.MinimumM}; expected metres above 0 and at most {MaxRvrM} (the highest reportable RVR)");
                }
            }
            if (op.Kind is OperationKind.CatII or OperationKind.CatIII or OperationKind.Lvto && !op.NeedsLvp)
            {
                Add($"{at}.needsLvp", $"is false for {op.Kind}; CAT II, CAT III and LVTO need LVP in force");
            }
        }
        return problems;
    }
}
