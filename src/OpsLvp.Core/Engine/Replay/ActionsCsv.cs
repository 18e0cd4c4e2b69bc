namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// Actions CSV (docs/replay.md): header <c>time,actor,action,target,value,reason</c>, fields quoted per
/// RFC 4180 when they hold commas. Actions: declare (target preparation|active), cancel, release_hold,
/// forecast (value on|off), release_forecast, light_step (value the step, 0 = lights off), sensor_out / sensor_in (target sensor id), confirm, tick (target item id, value
/// team id, reason = optional note), untick (target item id), ack (target alarm key), and the capability actions of
/// <see cref="CapabilityActions"/> (facility, runway_in_use, observer_rvr). Syntax errors throw
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
        foreach (var row in Csv.Rows(text, fileName, Header, 6))
        {
            var f = row.Fields;
            var time = row.TimeAt(0);
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
                    _ => throw row.Error($"declare target must be preparation or active, not '{target}'"),
                }, reason, value switch
                {
                    "" => null,
                    "override" => reason,
                    _ => throw row.Error($"declare value must be empty or override, not '{value}'"),
                }),
                "cancel" => new CancelLvp(actor, reason),
                "release_hold" => new ReleaseHold(actor, reason),
                "release_forecast" => new ReleaseForecast(actor, reason),
                "forecast" => new SetForecast(actor, value switch
                {
                    "on" => true,
                    "off" => false,
                    _ => throw row.Error($"forecast value must be on or off, not '{value}'"),
                }, reason),
                "sensor_out" => new SetSensorService(actor, Required(target, "target (sensor id)", row.Error), false, reason),
                "sensor_in" => new SetSensorService(actor, Required(target, "target (sensor id)", row.Error), true, reason),
                "light_step" => new SetLightStep(actor, int.TryParse(value, System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture, out var step)
                    ? step
                    : throw row.Error($"light_step value must be a whole step number (0 = lights off), not '{value}'"), reason),
                "confirm" => new ConfirmPending(actor, reason.Length == 0 ? null : reason),
                "tick" => new TickItem(actor, Required(value, "value (team id)", row.Error), Required(target, "target (item id)", row.Error), reason.Length == 0 ? null : reason),
                "untick" => new UntickItem(actor, Required(target, "target (item id)", row.Error), reason),
                "not_applicable" => new MarkNotApplicable(actor, Required(target, "target (item id)", row.Error), reason),
                "ack" => new AcknowledgeAlarm(actor, Required(target, "target (alarm key)", row.Error)),
                "facility" or "runway_in_use" or "observer_rvr" => CapabilityActions.Parse(f[2].Trim(), actor, target, value, reason, row.Error),
                var other => throw row.Error($"unknown action '{other}'"),
            };
            actions.Add(new TimedCommand(time, command));
        }
        return actions;
    }

    private static string Required(string field, string name, Func<string, FormatException> error) =>
        field.Length > 0 ? field : throw error($"{name} is empty");
}
