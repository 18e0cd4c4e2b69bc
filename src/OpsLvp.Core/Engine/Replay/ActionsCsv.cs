namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// Actions CSV (docs/replay.md): header <c>time,actor,action,target,value,reason</c>, fields quoted per
/// RFC 4180 when they hold commas. Actions: declare (target preparation|active), cancel, release_hold,
/// forecast (value on|off), sensor_out / sensor_in (target sensor id), confirm, tick (target item id, value
/// team id, reason = optional note), untick (target item id), ack (target alarm key). Syntax errors throw
/// <see cref="FormatException"/> naming file and line; whether an action can apply (a blank reason, an
/// unknown item) is the engine's decision and appears as a command_refused event.
/// </summary>
public static class ActionsCsv
{
    public const string Header = "time,actor,action,target,value,reason";

    public static IReadOnlyList<TimedCommand> Parse(string text, string fileName)
    {
        ArgumentNullException.ThrowIfNull(text);
        var actions = new List<TimedCommand>();
        var header = true;
        foreach (var (number, line) in Csv.Lines(text))
        {
            FormatException Error(string what) => new($"{fileName} line {number}: {what}");
            if (header)
            {
                if (line.Trim().TrimStart('\uFEFF') != Header)
                {
                    throw Error($"header must be '{Header}'");
                }
                header = false;
                continue;
            }
            var f = Csv.Split(line, Error);
            if (f.Count != 6)
            {
                throw Error($"expected 6 fields, found {f.Count}");
            }
            if (!Csv.TryTime(f[0], out var time))
            {
                throw Error($"bad time '{f[0]}' (ISO 8601 with Z or an offset)");
            }
            var actor = f[1].Trim();
            var target = f[3].Trim();
            var value = f[4].Trim();
            var reason = f[5];
            EngineCommand command = f[2].Trim() switch
            {
                "declare" => new DeclarePhase(actor, target switch
                {
                    "preparation" => Phase.Preparation,
                    "active" => Phase.Active,
                    _ => throw Error($"declare target must be preparation or active, not '{target}'"),
                }, reason),
                "cancel" => new CancelLvp(actor, reason),
                "release_hold" => new ReleaseHold(actor, reason),
                "forecast" => new SetForecast(actor, value switch
                {
                    "on" => true,
                    "off" => false,
                    _ => throw Error($"forecast value must be on or off, not '{value}'"),
                }, reason),
                "sensor_out" => new SetSensorService(actor, Required(target, "target (sensor id)", Error), false, reason),
                "sensor_in" => new SetSensorService(actor, Required(target, "target (sensor id)", Error), true, reason),
                "confirm" => new ConfirmPending(actor, reason.Length == 0 ? null : reason),
                "tick" => new TickItem(actor, Required(value, "value (team id)", Error), Required(target, "target (item id)", Error), reason.Length == 0 ? null : reason),
                "untick" => new UntickItem(actor, Required(target, "target (item id)", Error), reason),
                "ack" => new AcknowledgeAlarm(actor, Required(target, "target (alarm key)", Error)),
                var other => throw Error($"unknown action '{other}'"),
            };
            actions.Add(new TimedCommand(time, command));
        }
        if (header)
        {
            throw new FormatException($"{fileName}: empty file, header '{Header}' missing");
        }
        return actions;
    }

    private static string Required(string field, string name, Func<string, FormatException> error) =>
        field.Length > 0 ? field : throw error($"{name} is empty");
}
