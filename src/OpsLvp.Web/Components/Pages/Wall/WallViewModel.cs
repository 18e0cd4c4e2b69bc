using System.Globalization;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Presentation;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>
/// Everything the wall prints, computed from one <see cref="LiveSnapshot"/> and the clock. The page only lays it
/// out; every label, class and ordering is decided here so it can be unit tested. Holds no LVP decision: phases,
/// staleness, overdue and alarms come from the engine as they are.
/// </summary>
public sealed class WallViewModel
{
    /// <summary>Line budget of the checklist column at 1920×1080 (a team header, a "+ N more" line and a short item are one line each, a long item two).</summary>
    public const int ItemLineBudget = 19;

    /// <summary>Characters of item text per line in the checklist column (measured at 1920 px).</summary>
    public const int ItemCharsPerLine = 36;

    public const int MaxAlarms = 3;

    /// <summary>
    /// Lines of an alarm's message the wall shows under its headline: a long one (a database error named in full) is cut
    /// there, says so ("full text on the console"), and leaves room for the alarms after it.
    /// </summary>
    public const int AlarmMessageLines = 3;

    /// <summary>Height of the status column at 1920×1080 in tenths of a text line (alarms, notices, waiting).</summary>
    public const int StatusTenthsBudget = 215;

    /// <summary>Characters per line in the status column (measured at 1920 px).</summary>
    public const int StatusCharsPerLine = 35;

    public const int MaxFeeds = 6;

    private WallViewModel()
    {
    }

    public required WallPhaseLook Phase { get; init; }

    /// <summary>"since 21:41Z · 1 h 12 min".</summary>
    public required string PhaseSince { get; init; }

    /// <summary>"Episode XDMO-20261201T2036Z, deepest: LVP in force", or empty in normal.</summary>
    public required string EpisodeText { get; init; }

    public required string AerodromeText { get; init; }

    public required string ProfileText { get; init; }

    public required bool Illustrative { get; init; }

    /// <summary>"DEMO ×30", null outside demo mode.</summary>
    public required string? DemoBadge { get; init; }

    /// <summary>"22:18:04Z".</summary>
    public required string UtcTime { get; init; }

    /// <summary>"23:18:04", or "--:--:--" when the aerodrome's time zone is unknown to this machine.</summary>
    public required string LocalTime { get; init; }

    /// <summary>"local Europe/Lisbon", or "local time zone 'X' unknown".</summary>
    public required string LocalLabel { get; init; }

    public required IReadOnlyList<WallRunway> Runways { get; init; }

    public required WallFigure GoverningRvr { get; init; }

    /// <summary>Null when the aerodrome has no ceilometer (docs/engine.md R5): the wall leaves it out.</summary>
    public required WallFigure? Ceiling { get; init; }

    public required IReadOnlyList<WallThresholdRow> Thresholds { get; init; }

    public required IReadOnlyList<WallNotice> Notices { get; init; }

    /// <summary>Notes shown beside the phase (<see cref="StatusNotes"/>): safeguards incomplete, override, relaxed against conditions.</summary>
    public IReadOnlyList<string> PhaseNotes { get; init; } = [];

    public required IReadOnlyList<WallWait> Waiting { get; init; }

    public required IReadOnlyList<WallTeam> Teams { get; init; }

    /// <summary>"3 of 13 done · 2 late", or "no open items".</summary>
    public required string ItemsSummary { get; init; }

    public required IReadOnlyList<WallAlarm> Alarms { get; init; }

    public required int HiddenAlarms { get; init; }

    /// <summary>"All 6 RVR positions reporting" or "No fresh reading: 07L MID, 07R END".</summary>
    public required string SensorSummary { get; init; }

    public required bool SensorsAllAlive { get; init; }

    /// <summary>"Out of service: rvr-07r-end", empty when none.</summary>
    public required string OutOfServiceText { get; init; }

    public required IReadOnlyList<WallFeed> Feeds { get; init; }

    public static WallViewModel Build(LiveSnapshot snapshot, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(snapshot);
        var status = snapshot.Status;
        // Ages are measured from each reading's time to the server's clock now, never to the engine's last
        // evaluation: a frozen engine must not show "0 s old" (issue 13).
        var runways = BuildRunways(snapshot, now);
        var (localTime, localLabel) = Local(snapshot.Aerodrome.TimeZone, now);
        var (teams, summary) = BuildTeams(snapshot.Items, now);
        var notices = BuildNotices(status);
        var waiting = status.Waiting.Where(w => w.Kind is not (WaitKind.Confirmation or WaitKind.Hold)).Select(Wait).ToList();
        var alarms = status.Alarms
            .OrderBy(a => a.Acknowledged)
            .ThenByDescending(a => a.RaisedAt)
            .Select(a => Alarm(a, status.Pending))
            .ToList();
        var shownAlarms = AlarmsThatFit(alarms, notices, waiting);
        var silent = runways
            .SelectMany(r => r.Positions.Where(p => p.CssClass is "wall-pos-stale" or "wall-pos-missing").Select(p => $"{r.Title} {p.Position}"))
            .ToList();
        var watched = runways.Sum(r => r.Positions.Count(p => p.CssClass is not ("wall-pos-none" or "wall-pos-oos")));

        return new WallViewModel
        {
            Phase = WallPhaseLook.For(status),
            PhaseSince = $"since {Hm(status.PhaseSince)} · {Duration(now - status.PhaseSince)}",
            EpisodeText = status.Episode is { } e ? $"Episode {e.Id} · deepest: {WallPhaseLook.ShortName(e.DeepestPhase)}" : "",
            AerodromeText = $"{snapshot.Aerodrome.Id} · {snapshot.Aerodrome.Name}",
            ProfileText = $"profile {snapshot.Aerodrome.ProfileVersion}",
            Illustrative = snapshot.Aerodrome.Illustrative,
            DemoBadge = snapshot.Demo is { } demo ? string.Create(CultureInfo.InvariantCulture, $"DEMO ×{demo.Speed:0.##}") : null,
            UtcTime = DisplayFormat.UtcClockSeconds(now),
            LocalTime = localTime,
            LocalLabel = localLabel,
            Runways = runways,
            GoverningRvr = Figure("Governing RVR", status.GoverningRvr, v => DisplayFormat.Rvr(v), now, "no fresh governing RVR"),
            Ceiling = status.CeilingConfigured ? Figure("Ceiling", status.Ceiling, DisplayFormat.Feet, now, "no fresh ceiling") : null,
            Thresholds = [Row(WallPhaseLook.ShortName(Core.Engine.Phase.Preparation), status.Thresholds.Preparation), Row(WallPhaseLook.ShortName(Core.Engine.Phase.Active), status.Thresholds.Active)],
            Notices = notices,
            PhaseNotes = StatusNotes.For(status, snapshot.ItemText),
            Waiting = waiting,
            Teams = teams,
            ItemsSummary = summary,
            Alarms = alarms.Take(shownAlarms).ToList(),
            HiddenAlarms = alarms.Count - shownAlarms,
            SensorSummary = silent.Count == 0 ? $"All {watched} RVR positions reporting" : "No fresh reading: " + string.Join(", ", silent),
            SensorsAllAlive = silent.Count == 0,
            OutOfServiceText = snapshot.OutOfService.Count == 0 ? "" : "Out of service: " + string.Join(", ", snapshot.OutOfService),
            Feeds = snapshot.Feeds.Take(MaxFeeds).Select(Feed).ToList(),
        };
    }

    private static WallAlarm Alarm(Core.Engine.Alarm alarm, Core.Engine.PendingTransition? pending)
    {
        var message = AlarmWords.Message(alarm, pending);
        return new WallAlarm(
            alarm.Key,
            AlarmWords.Label(alarm.Kind),
            message,
            "since " + Hm(alarm.RaisedAt),
            alarm.Acknowledged,
            alarm.Acknowledged ? "wall-alarm-acked" : "wall-alarm-raised",
            Shortened: message.Length > AlarmMessageLines * StatusCharsPerLine - 15);
    }

    /// <summary>
    /// How many alarms the status column holds beside the notices and waits (always at least one when any is raised);
    /// the rest are counted as "+ N more". Costs are in tenths of a line, boxes include their padding.
    /// </summary>
    private static int AlarmsThatFit(List<WallAlarm> alarms, List<WallNotice> notices, List<WallWait> waiting)
    {
        static int Lines(int chars) => Math.Max(1, (chars + StatusCharsPerLine - 1) / StatusCharsPerLine) * 10;
        const int title = 12;
        var used = 2 * title
            + notices.Sum(n => Lines(n.Label.Length + 1 + n.Text.Length) + 8)
            + waiting.Sum(w => Lines(w.Text.Length) + (w.Percent is null ? 3 : 11));
        var shown = 0;
        foreach (var alarm in alarms.Take(MaxAlarms))
        {
            // the headline (label, time) is one line, the message at most AlarmMessageLines, then "full text on the console"
            var head = Lines(alarm.Label.Length + 1 + alarm.Since.Length + (alarm.Acknowledged ? 15 : 0));
            var cost = head + Math.Min(Lines(alarm.Message.Length), AlarmMessageLines * 10) + (alarm.Shortened ? 10 : 0) + 6;
            var moreLine = alarms.Count > shown + 1 ? 10 : 0;
            if (shown > 0 && used + cost + moreLine > StatusTenthsBudget)
            {
                break;
            }
            used += cost;
            shown++;
        }
        return shown;
    }

    /// <summary>The one duration format (<see cref="DisplayFormat.Duration"/>): "45 s", "4 min 20 s", "1 h 05 min".</summary>
    public static string Duration(TimeSpan span) => DisplayFormat.Duration(span);

    private static string Hm(DateTimeOffset t) => DisplayFormat.UtcClock(t);

    private static string N(double value) => DisplayFormat.Number(value);

    private static (string Time, string Label) Local(string timeZone, DateTimeOffset now) =>
        DisplayFormat.LocalClockSeconds(now, timeZone) is { } local
            ? (local, "local " + timeZone)
            : ("--:--:--", $"local time zone '{timeZone}' unknown");

    private static List<WallRunway> BuildRunways(LiveSnapshot snapshot, DateTimeOffset now)
    {
        var trends = snapshot.Trends.GroupBy(t => t.SensorId).ToDictionary(g => g.Key, g => g.Last());
        var runways = snapshot.Status.Runways
            .Select(r => (Runway: r, Positions: r.Positions.Select(p => Position(p, trends, now)).ToList()))
            .ToList();
        var usable = runways.SelectMany(r => r.Positions).Select(p => p.Value).Where(v => v is not null).ToList();
        // When every usable position reads the same there is no lowest worth pointing at.
        var lowest = usable.Distinct().Count() > 1 ? usable.Min() : null;
        return runways
            .Select(r => new WallRunway(
                $"RWY {r.Runway.Direction}",
                r.Runway.RunwayId,
                r.Positions.Select(p => p.Value is not null && p.Value == lowest ? p with { Lowest = true } : p).ToList()))
            .ToList();
    }

    private static WallPosition Position(PositionRvr p, Dictionary<string, SensorTrend> trends, DateTimeOffset now)
    {
        var name = p.Position switch
        {
            RvrPosition.Tdz => "TDZ",
            RvrPosition.Mid => "MID",
            RvrPosition.End => "END",
            _ => p.Position.ToString().ToUpperInvariant(),
        };
        var trend = p.SensorId is not null && trends.TryGetValue(p.SensorId, out var t) ? t : null;
        var (arrow, word) = trend?.Tendency switch
        {
            "U" => ("↑", "rising"),
            "D" => ("↓", "falling"),
            "N" => ("→", "steady"),
            _ => ("", ""),
        };
        var mean = trend?.OneMinuteMeanM is { } m ? $"1-min {N(m)} m" : "";
        if (p.SensorId is null)
        {
            return new(name, "–", "", "", "", "no sensor", "wall-pos-none", false, p.Governing, null);
        }
        if (p.OutOfService)
        {
            return new(name, "–", "", "", "", "OUT OF SERVICE", "wall-pos-oos", false, p.Governing, null);
        }
        if (p.Reading is not { } r)
        {
            return new(name, "–", "", "", "", "no reading yet", "wall-pos-missing", false, p.Governing, null);
        }
        var age = Duration(now - r.Time);
        var value = DisplayFormat.RvrNumber(r.Value);
        return r.Stale
            ? new(name, value, "", "", "", $"STALE · {age}", "wall-pos-stale", false, p.Governing, null)
            : new(name, value, mean, arrow, word, $"{age} old", "wall-pos-fresh", false, p.Governing, r.Value);
    }

    private static WallFigure Figure(string label, MeasuredValue? value, Func<double, string> format, DateTimeOffset now, string unknown) => value switch
    {
        null => new(label, "UNKNOWN", unknown, "wall-fig-unknown"),
        { Stale: true } v => new(label, $"{ReadingFlagText.ValuePrefix(v.Flags)}{format(v.Value)}", $"STALE · {v.Label}{FlagNote(v.Flags)}", "wall-fig-stale"),
        var v => new(label, $"{ReadingFlagText.ValuePrefix(v.Flags)}{format(v.Value)}", $"{v.Label} · {Duration(now - v.Time)} old{FlagNote(v.Flags)}", "wall-fig-fresh"),
    };

    // "luminance unknown" and the like beside the value (docs/engine.md R19–R22); "or more" is the value's "≥" prefix.
    private static string FlagNote(ReadingFlags flags) => (flags & ~ReadingFlags.OrMore) switch
    {
        ReadingFlags.None => "",
        var rest => " · " + ReadingFlagText.Describe(rest),
    };

    private static WallThresholdRow Row(string phase, PhaseThresholds t)
    {
        static string Part(double? value, string unit) => value is { } v ? $"{N(v)} {unit}" : "";
        static string Join(params string[] parts) => string.Join(" · ", parts.Where(p => p.Length > 0)) is { Length: > 0 } s ? s : "–";
        return new(
            phase,
            Join(Part(t.RvrBelowM, "m"), Part(t.CeilingBelowFt, "ft")),
            Join(Part(t.RvrRecoverM, "m"), Part(t.CeilingRecoverFt, "ft")),
            $"{Duration(TimeSpan.FromSeconds(t.EnterDwellSeconds))} / {Duration(TimeSpan.FromSeconds(t.RecoverDwellSeconds))}");
    }

    private static List<WallNotice> BuildNotices(EngineStatus status)
    {
        var notices = new List<WallNotice>();
        if (status.Pending is { } p)
        {
            notices.Add(new(
                "AWAITING CONFIRMATION",
                $"{LvpVocabulary.Change(p.From, p.To)}, proposed {Hm(p.ConditionMetAt)}: {p.Reason}",
                "wall-notice-pending"));
        }
        if (status.Hold is { } h)
        {
            notices.Add(new(
                "HOLD",
                $"at least {WallPhaseLook.ShortName(h.Phase)} since {Hm(h.Since)}, by {h.Actor}: {h.Reason}",
                "wall-notice-hold"));
        }
        return notices;
    }

    private static WallWait Wait(WaitingFor w)
    {
        int? percent = w is { HeldSeconds: { } held, RequiredSeconds: { } required } && required > 0
            ? (int)Math.Clamp(Math.Floor(held / required * 100), 0, 100)
            : null;
        var css = w.Kind switch
        {
            WaitKind.EscalationDwell => "wall-wait-escalation",
            WaitKind.RecoveryDwell => "wall-wait-recovery",
            WaitKind.RecoveryBlocked => "wall-wait-blocked",
            _ => "wall-wait-other",
        };
        return new(w.Text, percent, css);
    }

    private static (List<WallTeam> Teams, string Summary) BuildTeams(IReadOnlyList<ChecklistItemView> items, DateTimeOffset now)
    {
        var live = items.Where(i => i.Status is ItemStatus.Open or ItemStatus.Done or ItemStatus.NotApplicable).ToList();
        var open = live.Where(i => i.Status == ItemStatus.Open).ToList();
        var late = open.Count(i => i.Overdue);
        var summary = open.Count == 0
            ? (live.Count == 0 ? "no open items" : $"all {live.Count} done")
            : $"{live.Count - open.Count} of {live.Count} done" + (late > 0 ? $" · {late} late" : "");

        var groups = open
            .GroupBy(i => i.TeamName)
            .Select(g => g.OrderByDescending(i => i.Overdue).ThenBy(i => i.DueAt).ThenBy(i => i.ItemId, StringComparer.Ordinal).ToList())
            .OrderByDescending(g => g.Any(i => i.Overdue))
            .ThenBy(g => g.Min(i => i.DueAt))
            .ThenBy(g => g[0].TeamName, StringComparer.Ordinal)
            .ToList();
        // Every team with open work keeps its header and, room allowing, its most urgent item; then the rest fill
        // what is left in team order. A team's "+ N more" line costs a line as well.
        static int Lines(ChecklistItemView i) => Math.Max(1, (i.Text.Length + ItemCharsPerLine - 1) / ItemCharsPerLine);
        var shownCount = new int[groups.Count];
        var used = groups.Count * 2;
        for (var pass = 0; pass < 2; pass++)
        {
            for (var g = 0; g < groups.Count; g++)
            {
                while (shownCount[g] < groups[g].Count && (pass == 1 || shownCount[g] == 0))
                {
                    var lastHidden = shownCount[g] == groups[g].Count - 1;
                    var delta = Lines(groups[g][shownCount[g]]) - (lastHidden ? 1 : 0);
                    if (used + delta > ItemLineBudget)
                    {
                        break;
                    }
                    used += delta;
                    shownCount[g]++;
                }
            }
        }

        var teams = new List<WallTeam>();
        for (var g = 0; g < groups.Count; g++)
        {
            var group = groups[g];
            var shown = group.Take(shownCount[g]).Select(item => new WallItem(
                item.ItemId,
                item.Text,
                item.Overdue ? $"LATE {Duration(now - item.DueAt)}" : $"due {Hm(item.DueAt)}",
                item.Overdue,
                item.Mandatory)).ToList();
            var lateHere = group.Count(i => i.Overdue);
            teams.Add(new WallTeam(
                group[0].TeamName,
                $"{group.Count} open" + (lateHere > 0 ? $" · {lateHere} late" : ""),
                lateHere > 0,
                shown,
                group.Count - shown.Count));
        }
        return (teams, summary);
    }

    private static WallFeed Feed(Feeds.FeedHealthDto f)
    {
        var (glyph, word, css) = f.Status switch
        {
            "ok" => ("✓", "OK", "wall-feed-ok"),
            "degraded" => ("!", "DEGRADED", "wall-feed-degraded"),
            _ => ("✕", "DOWN", "wall-feed-down"),
        };
        // A healthy feed needs no explanation on the wall; the others say why or since when.
        var detail = f.Status == "ok" ? "" : f.Detail ?? (f.LastGoodAt is { } good ? "last good " + Hm(good) : "no data yet");
        return new(f.Name, glyph, word, detail, css);
    }
}
