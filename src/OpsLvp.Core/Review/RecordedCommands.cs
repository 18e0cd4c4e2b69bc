using System.Text;
using OpsLvp.Core.Engine.Replay;

namespace OpsLvp.Core.Review;

/// <summary>
/// The people's commands that an episode's events record, as actions-file rows, so the episode can be replayed:
/// ticks, unticks, confirmations, alarm acknowledgements and the manual actions of docs/engine.md R9 (declare, cancel,
/// release_hold, forecast, sensor_out, sensor_in). Refused commands are left out: they changed nothing.
/// </summary>
public static class RecordedCommands
{
    private const string SensorPrefix = "sensor ";
    private const string LightStepPrefix = "light step ";
    private const string DeclaredPrefix = "declared ";

    /// <summary>The action rows, in event order.</summary>
    public static IReadOnlyList<ActionRow> FromEvents(IEnumerable<RecordedEvent> events)
    {
        ArgumentNullException.ThrowIfNull(events);
        var rows = new List<ActionRow>();
        foreach (var e in events)
        {
            var actor = e.Str("actor") ?? "";
            ActionRow? row = e.Name switch
            {
                "item_ticked" => new ActionRow(e.At, actor, "tick", e.Str("item") ?? "", e.Str("team") ?? "", e.Str("note") ?? ""),
                "item_unticked" => new ActionRow(e.At, actor, "untick", e.Str("item") ?? "", "", e.Str("reason") ?? ""),
                "item_not_applicable" => new ActionRow(e.At, actor, "not_applicable", e.Str("item") ?? "", "", e.Str("reason") ?? ""),
                "confirmation" => new ActionRow(e.At, actor, "confirm", "", "", e.Str("reason") ?? ""),
                "alarm_acknowledged" => new ActionRow(e.At, actor, "ack", e.Str("key") ?? "", "", ""),
                "manual_action" when e.Str("action") == "override_safeguards" => null,
                "manual_action" => Manual(e, actor),
                _ => null,
            };
            if (e.Name == "manual_action" && e.Str("action") == "override_safeguards")
            {
                // follows its declare at the same instant (docs/engine.md R13): the actions file says "override" there
                var declare = rows.FindLastIndex(r => r.Action == "declare" && r.Time == e.At && r.Actor == actor);
                if (declare < 0)
                {
                    throw new FormatException($"manual_action at {e.At:O}: override_safeguards without its declare");
                }
                rows[declare] = rows[declare] with { Value = "override" };
            }
            if (row is not null)
            {
                rows.Add(row);
            }
        }
        return rows;
    }

    /// <summary>The rows as an actions CSV (header and RFC 4180 quoting), readable by <see cref="ActionsCsv.Parse"/>.</summary>
    public static string ToCsv(IEnumerable<ActionRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var sb = new StringBuilder(ActionsCsv.Header).Append('\n');
        foreach (var r in rows)
        {
            sb.Append(ReviewCsv.Time(r.Time)).Append(',')
                .Append(ReviewCsv.Field(r.Actor)).Append(',')
                .Append(ReviewCsv.Field(r.Action)).Append(',')
                .Append(ReviewCsv.Field(r.Target)).Append(',')
                .Append(ReviewCsv.Field(r.Value)).Append(',')
                .Append(ReviewCsv.Field(r.Reason)).Append('\n');
        }
        return sb.ToString();
    }

    /// <summary>The rows as engine commands, through the actions-file parser.</summary>
    public static IReadOnlyList<TimedCommand> ToCommands(IEnumerable<ActionRow> rows, string sourceName) =>
        ActionsCsv.Parse(ToCsv(rows), sourceName);

    private static ActionRow? Manual(RecordedEvent e, string actor)
    {
        var action = e.Str("action") ?? "";
        var detail = e.Str("detail") ?? "";
        var reason = e.Str("reason") ?? "";
        return action switch
        {
            "declare" => new ActionRow(e.At, actor, "declare", DeclaredPhase(detail), "", reason),
            "cancel" or "release_hold" or "release_forecast" => new ActionRow(e.At, actor, action, "", "", reason),
            "forecast" => new ActionRow(e.At, actor, "forecast", "", detail.EndsWith(" on", StringComparison.Ordinal) ? "on" : "off", reason),
            "sensor_out" or "sensor_in" => new ActionRow(e.At, actor, action, SensorId(detail), "", reason),
            "light_step" => new ActionRow(e.At, actor, "light_step", "", LightStep(detail), reason),
            "facility" or "runway_in_use" or "observer_rvr" => CapabilityRecordedCommands.Row(e.At, actor, action, detail, reason),
            _ => throw new FormatException($"manual_action at {e.At:O}: unknown action '{action}'"),
        };
    }

    // "declared active (hold)" (LvpEngine's detail text)
    private static string DeclaredPhase(string detail) =>
        detail.StartsWith(DeclaredPrefix, StringComparison.Ordinal)
            ? detail[DeclaredPrefix.Length..].Split(' ')[0]
            : throw new FormatException($"declare detail '{detail}' does not name the phase");

    // "light step 3" / "light step 0 (lights off)"
    private static string LightStep(string detail) =>
        detail.StartsWith(LightStepPrefix, StringComparison.Ordinal)
            ? detail[LightStepPrefix.Length..].Split(' ')[0]
            : throw new FormatException($"light step detail '{detail}' does not name the step");

    // "sensor rvr-07l-tdz out of service" / "... back in service"
    private static string SensorId(string detail) =>
        detail.StartsWith(SensorPrefix, StringComparison.Ordinal)
            ? detail[SensorPrefix.Length..].Split(' ')[0]
            : throw new FormatException($"sensor detail '{detail}' does not name the sensor");
}
