using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Engine.Replay;

/// <summary>
/// One JSON object per event (JSON Lines, docs/replay.md): always <c>event</c> and <c>time</c> first;
/// transitions are <c>{"event":"transition","time":…,"from":…,"to":…,"by":"auto"|"manual","reason":…}</c>
/// followed by actor, proposed_at and the condition snapshot (values, sensors and, last, the thresholds in effect
/// for both graded phases, docs/engine.md R12). Names snake_case, times UTC with Z.
/// </summary>
public static class EventJson
{
    private static readonly JsonWriterOptions Options = new() { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    /// <summary>The stable event name written in the "event" field.</summary>
    public static string Name(EngineEvent e) => e switch
    {
        PhaseTransition => "transition",
        TransitionProposed => "proposal",
        ProposalWithdrawn => "proposal_withdrawn",
        TransitionConfirmed => "confirmation",
        ReadingRejected => "reading_rejected",
        ChecklistOpened => "checklist_opened",
        ItemTicked => "item_ticked",
        ItemUnticked => "item_unticked",
        ItemMarkedNotApplicable => "item_not_applicable",
        ItemsClosed => "items_closed",
        AlarmRaised => "alarm_raised",
        AlarmAcknowledged => "alarm_acknowledged",
        AlarmCleared => "alarm_cleared",
        ManualActionApplied => "manual_action",
        CommandRefused => "command_refused",
        EpisodeStarted => "episode_started",
        EpisodeEnded => "episode_ended",
        CapabilityChanged => "capability_changed",
        _ => Snake(e.GetType().Name),
    };

    /// <summary>The event as one line of JSON (no line break).</summary>
    public static string ToLine(EngineEvent e)
    {
        ArgumentNullException.ThrowIfNull(e);
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, Options))
        {
            w.WriteStartObject();
            w.WriteString("event", Name(e));
            w.WriteString("time", Fmt.Time(e.At));
            switch (e)
            {
                case PhaseTransition t:
                    w.WriteString("from", Fmt.Name(t.From));
                    w.WriteString("to", Fmt.Name(t.To));
                    w.WriteString("by", t.By == TransitionBy.Auto ? "auto" : "manual");
                    w.WriteString("reason", t.Reason);
                    Optional(w, "actor", t.Actor);
                    if (t.ProposedAt is { } proposed)
                    {
                        w.WriteString("proposed_at", Fmt.Time(proposed));
                    }
                    Snapshot(w, t.Snapshot);
                    break;
                case TransitionProposed p:
                    w.WriteString("from", Fmt.Name(p.From));
                    w.WriteString("to", Fmt.Name(p.To));
                    w.WriteString("reason", p.Reason);
                    Snapshot(w, p.Snapshot);
                    break;
                case ProposalWithdrawn p:
                    w.WriteString("from", Fmt.Name(p.From));
                    w.WriteString("to", Fmt.Name(p.To));
                    w.WriteString("proposed_at", Fmt.Time(p.ProposedAt));
                    w.WriteString("reason", p.Reason);
                    break;
                case TransitionConfirmed c:
                    w.WriteString("from", Fmt.Name(c.From));
                    w.WriteString("to", Fmt.Name(c.To));
                    w.WriteString("actor", c.Actor);
                    w.WriteString("proposed_at", Fmt.Time(c.ProposedAt));
                    Optional(w, "reason", c.Reason);
                    break;
                case ReadingRejected r:
                    w.WriteString("sensor", r.Reading.SensorId);
                    w.WriteString("kind", ReadingsCsv.KindName(r.Reading.Kind));
                    w.WriteString("reading_time", Fmt.Time(r.Reading.Time));
                    Number(w, "value", r.Reading.Value);
                    w.WriteString("status", r.Reading.Status.ToString().ToLowerInvariant());
                    w.WriteString("reject", Snake(r.Reason.ToString()));
                    w.WriteString("detail", r.Detail);
                    break;
                case ChecklistOpened o:
                    w.WriteString("phase", Fmt.Name(o.Phase));
                    Strings(w, "items", o.ItemIds);
                    break;
                case ItemTicked t:
                    w.WriteString("item", t.ItemId);
                    w.WriteString("actor", t.Tick.User);
                    w.WriteString("team", t.Tick.Team);
                    Optional(w, "note", t.Tick.Note);
                    break;
                case ItemUnticked u:
                    w.WriteString("item", u.ItemId);
                    w.WriteString("actor", u.Actor);
                    w.WriteString("reason", u.Reason);
                    w.WriteString("undone_tick_by", u.UndoneTick.User);
                    w.WriteString("undone_tick_at", Fmt.Time(u.UndoneTick.At));
                    break;
                case ItemMarkedNotApplicable n:
                    w.WriteString("item", n.ItemId);
                    w.WriteString("actor", n.Actor);
                    w.WriteString("reason", n.Reason);
                    break;
                case ItemsClosed c:
                    w.WriteString("status", c.Status == ItemStatus.Voided ? "voided" : "closed_not_done");
                    Strings(w, "items", c.ItemIds);
                    break;
                case AlarmRaised a:
                    w.WriteString("key", a.Alarm.Key);
                    w.WriteString("kind", Snake(a.Alarm.Kind.ToString()));
                    w.WriteString("message", a.Alarm.Message);
                    break;
                case AlarmAcknowledged a:
                    w.WriteString("key", a.Key);
                    w.WriteString("kind", Snake(a.Kind.ToString()));
                    w.WriteString("actor", a.Actor);
                    break;
                case AlarmCleared a:
                    w.WriteString("key", a.Key);
                    w.WriteString("kind", Snake(a.Kind.ToString()));
                    break;
                case ManualActionApplied m:
                    w.WriteString("action", m.Action);
                    w.WriteString("actor", m.Actor);
                    w.WriteString("detail", m.Detail);
                    w.WriteString("reason", m.Reason);
                    break;
                case CommandRefused c:
                    w.WriteString("command", Snake(c.Command.GetType().Name));
                    w.WriteString("actor", c.Command.Actor);
                    w.WriteString("reason", c.Reason);
                    break;
                case EpisodeStarted s:
                    w.WriteString("episode", s.EpisodeId);
                    break;
                case ForecastReceived f:
                    w.WriteString("origin", f.Origin == Forecast.ForecastOrigin.Taf ? "taf" : "trend");
                    w.WriteString("station", f.Station);
                    w.WriteString("issued", Fmt.Time(f.IssuedAt));
                    w.WriteString("valid_from", Fmt.Time(f.ValidFrom));
                    w.WriteString("valid_until", Fmt.Time(f.ValidUntil));
                    w.WriteString("text", f.Text);
                    Optional(w, "note", f.Note);
                    break;
                case ForecastRejected f:
                    w.WriteString("origin", f.Origin == Forecast.ForecastOrigin.Taf ? "taf" : "trend");
                    w.WriteString("text", f.Text);
                    w.WriteString("reason", f.Reason);
                    break;
                case ForecastFlagChanged f:
                    w.WriteBoolean("on", f.On);
                    w.WriteString("by", f.Manual ? "manual" : "forecast");
                    Optional(w, "source", f.Source, writeNull: true);
                    w.WriteString("reason", f.Reason);
                    if (f.From is { } windowFrom && f.Until is { } windowUntil)
                    {
                        w.WriteString("window_from", Fmt.Time(windowFrom));
                        w.WriteString("window_until", Fmt.Time(windowUntil));
                    }
                    break;
                case CapabilityChanged c:
                    CapabilityJson.Write(w, c);
                    break;
                case EpisodeEnded s:
                    w.WriteString("episode", s.EpisodeId);
                    w.WriteString("start", Fmt.Time(s.Start));
                    w.WriteString("deepest_phase", Fmt.Name(s.DeepestPhase));
                    break;
                default:
                    break;
            }
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(stream.ToArray());
    }

    private static void Snapshot(Utf8JsonWriter w, ConditionSnapshot s)
    {
        NullableNumber(w, "governing_rvr_m", s.GoverningRvrM);
        Optional(w, "governing_rvr_sensor", s.GoverningRvrSensor, writeNull: true);
        if (s.GoverningRvrFlags != ReadingFlags.None)
        {
            // only when flagged, so unflagged lines stay as they were (docs/engine.md R19–R22)
            w.WriteStartArray("governing_rvr_flags");
            foreach (var word in ReadingFlagText.Words(s.GoverningRvrFlags))
            {
                w.WriteStringValue(word);
            }
            w.WriteEndArray();
        }
        NullableNumber(w, "ceiling_ft", s.CeilingFt);
        Optional(w, "ceiling_sensor", s.CeilingSensor, writeNull: true);
        w.WriteBoolean("forecast", s.DeteriorationForecast);
        w.WriteBoolean("recovery_inputs_complete", s.RecoveryInputsComplete);
        w.WriteStartObject("thresholds");
        Thresholds(w, "preparation", s.Thresholds.Preparation);
        Thresholds(w, "active", s.Thresholds.Active);
        w.WriteEndObject();
    }

    /// <summary>The thresholds in effect for one phase (docs/engine.md R12 "thresholds"); null where the phase leaves an input out.</summary>
    private static void Thresholds(Utf8JsonWriter w, string name, Profile.PhaseThresholds p)
    {
        w.WriteStartObject(name);
        NullableNumber(w, "rvr_below_m", p.RvrBelowM);
        NullableNumber(w, "rvr_recover_m", p.RvrRecoverM);
        NullableNumber(w, "ceiling_below_ft", p.CeilingBelowFt);
        NullableNumber(w, "ceiling_recover_ft", p.CeilingRecoverFt);
        w.WriteNumber("enter_dwell_seconds", p.EnterDwellSeconds);
        w.WriteNumber("recover_dwell_seconds", p.RecoverDwellSeconds);
        w.WriteEndObject();
    }

    private static void Optional(Utf8JsonWriter w, string name, string? value, bool writeNull = false)
    {
        if (value is not null)
        {
            w.WriteString(name, value);
        }
        else if (writeNull)
        {
            w.WriteNull(name);
        }
    }

    private static void Number(Utf8JsonWriter w, string name, double value)
    {
        if (double.IsFinite(value))
        {
            w.WriteNumber(name, value);
        }
        else
        {
            w.WriteString(name, value.ToString(System.Globalization.CultureInfo.InvariantCulture));
        }
    }

    private static void NullableNumber(Utf8JsonWriter w, string name, double? value)
    {
        if (value is { } v)
        {
            Number(w, name, v);
        }
        else
        {
            w.WriteNull(name);
        }
    }

    private static void Strings(Utf8JsonWriter w, string name, IEnumerable<string> values)
    {
        w.WriteStartArray(name);
        foreach (var v in values)
        {
            w.WriteStringValue(v);
        }
        w.WriteEndArray();
    }

    private static string Snake(string pascal)
    {
        var sb = new StringBuilder();
        for (var i = 0; i < pascal.Length; i++)
        {
            if (char.IsUpper(pascal[i]) && i > 0)
            {
                sb.Append('_');
            }
            sb.Append(char.ToLowerInvariant(pascal[i]));
        }
        return sb.ToString();
    }
}
