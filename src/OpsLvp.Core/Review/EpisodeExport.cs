using System.Globalization;
using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Review;

/// <summary>
/// The episode export (format <see cref="Format"/>, docs/review.md): the profile it ran under (version and the
/// profile itself), the readings from a lead-in before the start to the end, the people's commands as action rows,
/// the recorded events, and the episode's audit entries with their hashes. <c>opslvp replay --episode</c> replays it;
/// <c>opslvp audit verify --export</c> checks its audit entries.
/// </summary>
/// <param name="ReplayUntil">The instant a replay advances to (the episode end, or the last input while running).</param>
public sealed record EpisodeExport(
    string EpisodeId,
    DateTimeOffset Start,
    DateTimeOffset? End,
    Phase DeepestPhase,
    AerodromeProfile Profile,
    IReadOnlyList<Reading> Readings,
    IReadOnlyList<ActionRow> Actions,
    IReadOnlyList<RecordedEvent> Events,
    IReadOnlyList<AuditEntry> Audit,
    DateTimeOffset ReplayUntil)
{
    public const string Format = "opslvp.episode.v1";

    /// <summary>
    /// The capability of each runway direction just before <see cref="From"/> (docs/capability.md "Review"), from the
    /// events recorded before it; the export's own events carry every change after. Empty for an export written before
    /// exports carried it, or with no capability section.
    /// </summary>
    public IReadOnlyList<CapabilityState> CapabilityAtStart { get; init; } = [];

    /// <summary>The first instant the export covers: the start less the lead-in.</summary>
    public DateTimeOffset From => Start - LeadIn(Profile);

    /// <summary>Every capability change from <see cref="From"/> to <see cref="ReplayUntil"/> against <see cref="CapabilityAtStart"/>.</summary>
    public IReadOnlyList<CapabilityChange> CapabilityChanges() => CapabilityBands.Changes(CapabilityAtStart, Events, From, ReplayUntil);

    /// <summary>The recorded capability per runway direction from <paramref name="from"/> (default <see cref="From"/>) to <paramref name="to"/> (default <see cref="ReplayUntil"/>).</summary>
    public IReadOnlyList<CapabilityBand> CapabilityBandsRecorded(DateTimeOffset? from = null, DateTimeOffset? to = null)
    {
        var start = from ?? From;
        var atStart = CapabilityBands.StatesBefore(CapabilityAtStart, Events, start);
        return CapabilityBands.Of(atStart, Events, start, to ?? ReplayUntil);
    }

    private static readonly JsonWriterOptions WriterOptions = new() { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping, Indented = true };

    /// <summary>
    /// Readings this long before the start are included, so a replay starting from normal sees the lead-up and
    /// reaches the same transitions: the longest dwell plus the longest reading age plus 15 minutes.
    /// </summary>
    public static TimeSpan LeadIn(AerodromeProfile profile)
    {
        ArgumentNullException.ThrowIfNull(profile);
        var t = profile.Thresholds;
        var dwell = new[] { t.Preparation.EnterDwellSeconds, t.Preparation.RecoverDwellSeconds, t.Active.EnterDwellSeconds, t.Active.RecoverDwellSeconds }.Max();
        var age = profile.MaxAgeSeconds.Count > 0 ? profile.MaxAgeSeconds.Values.Max() : 0;
        return TimeSpan.FromSeconds(dwell + age) + TimeSpan.FromMinutes(15);
    }

    /// <summary>
    /// Builds the export of <paramref name="episode"/> from everything recorded: readings and events are cut to
    /// [start − <see cref="LeadIn"/>, end], audit entries to those whose time is in [start, end].
    /// </summary>
    public static EpisodeExport Create(EpisodeSummary episode, AerodromeProfile profile, IReadOnlyList<Reading> readings, IReadOnlyList<RecordedEvent> events, IReadOnlyList<AuditEntry> audit)
    {
        ArgumentNullException.ThrowIfNull(episode);
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(readings);
        ArgumentNullException.ThrowIfNull(events);
        ArgumentNullException.ThrowIfNull(audit);
        var from = episode.Start - LeadIn(profile);
        var cut = readings.Where(r => r.Time >= from && (episode.End is null || r.Time <= episode.End)).ToList();
        // forecasts received before the lead-in that are still valid at its start count in the replay too (docs/engine.md R25)
        var inEpisode = events.Where(e => (e.At >= from || (e.Name == ForecastReceivedName && e.TimeField("valid_until") > from))
            && (episode.End is null || e.At <= episode.End)).ToList();
        var until = episode.End ?? new[] { cut.Count > 0 ? cut.Max(r => r.Time) : episode.Start, inEpisode.Count > 0 ? inEpisode.Max(e => e.At) : episode.Start }.Max();
        // facility statuses and directions in use set before the lead-in still count in the replay (docs/review.md)
        var carried = CapabilityCarryOver.Rows(events, profile, from);
        return new EpisodeExport(
            episode.Id,
            episode.Start,
            episode.End,
            episode.DeepestPhase,
            profile,
            cut,
            carried.Concat(RecordedCommands.FromEvents(inEpisode)).ToList(),
            inEpisode,
            audit.Where(a => a.Time >= episode.Start && (episode.End is null || a.Time <= episode.End)).OrderBy(a => a.Sequence).ToList(),
            until)
        {
            CapabilityAtStart = CapabilityBands.StatesBefore([], events, from),
        };
    }

    /// <summary>
    /// Replays the export's readings, commands and received forecasts (each at the instant it was received) through
    /// <see cref="ReplayRunner"/> with <paramref name="profile"/> (default: its own).
    /// </summary>
    public ReplayResult Replay(AerodromeProfile? profile = null) =>
        ReplayRunner.Run(profile ?? Profile, Readings, RecordedCommands.ToCommands(Actions, $"episode {EpisodeId} actions"), ForecastsFrom(Readings.Count > 0 ? Readings[0].Time : Start), ReplayUntil);

    /// <summary>
    /// The forecasts received, those received before the replay's first reading given at that instant instead (the
    /// flag is then what it was live: it depends on the forecasts held and their issue times, not on when they came).
    /// </summary>
    private IReadOnlyList<ForecastInput> ForecastsFrom(DateTimeOffset first) =>
        ForecastsOf(Events).Select(f => f.ReceivedAt < first ? f with { ReceivedAt = first } : f).ToList();

    /// <summary>The event name of a received forecast (<see cref="ForecastReceived"/>).</summary>
    public const string ForecastReceivedName = "forecast_received";

    /// <summary>The forecasts the recorded events say were received, as replay inputs at their instants.</summary>
    public static IReadOnlyList<ForecastInput> ForecastsOf(IEnumerable<RecordedEvent> events)
    {
        ArgumentNullException.ThrowIfNull(events);
        return events.Where(e => e.Name == ForecastReceivedName && e.Str("text") is not null)
            .Select(e => new ForecastInput(e.Str("origin") == "trend" ? Forecast.ForecastOrigin.Trend : Forecast.ForecastOrigin.Taf, e.Str("text")!, e.At))
            .ToList();
    }

    public string ToJson()
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, WriterOptions))
        {
            w.WriteStartObject();
            w.WriteString("format", Format);
            w.WriteStartObject("episode");
            w.WriteString("id", EpisodeId);
            w.WriteString("start", ReviewCsv.Time(Start));
            if (End is { } end)
            {
                w.WriteString("end", ReviewCsv.Time(end));
            }
            else
            {
                w.WriteNull("end");
            }
            w.WriteString("deepest_phase", DeepestPhase.ToString().ToLowerInvariant());
            w.WriteString("replay_until", ReviewCsv.Time(ReplayUntil));
            w.WriteEndObject();
            w.WriteString("profile_version", Profile.Version);
            w.WritePropertyName("profile");
            w.WriteRawValue(ProfileLoader.Serialize(Profile));
            w.WriteStartArray("readings");
            foreach (var r in Readings)
            {
                w.WriteStartObject();
                w.WriteString("time", ReviewCsv.Time(r.Time));
                w.WriteString("sensor", r.SensorId);
                w.WriteString("kind", ReadingsCsv.KindName(r.Kind));
                w.WriteNumber("value", r.Value);
                w.WriteString("status", r.Status.ToString().ToLowerInvariant());
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("actions");
            foreach (var a in Actions)
            {
                w.WriteStartObject();
                w.WriteString("time", ReviewCsv.Time(a.Time));
                w.WriteString("actor", a.Actor);
                w.WriteString("action", a.Action);
                w.WriteString("target", a.Target);
                w.WriteString("value", a.Value);
                w.WriteString("reason", a.Reason);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("events");
            foreach (var e in Events)
            {
                w.WriteRawValue(e.Json);
            }
            w.WriteEndArray();
            CapabilityExport.Write(w, this);
            w.WriteStartArray("audit");
            foreach (var a in Audit)
            {
                w.WriteStartObject();
                w.WriteNumber("sequence", a.Sequence);
                w.WriteString("time", AuditCanonical.FormatTime(a.Time));
                w.WriteString("actor", a.Actor);
                w.WriteString("kind", a.Kind);
                w.WriteString("payload_json", a.PayloadJson);
                w.WriteString("previous_hash", a.PreviousHash);
                w.WriteString("hash", a.Hash);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(stream.ToArray());
    }

    /// <summary>Reads an export; throws <see cref="FormatException"/> naming the field that is missing or wrong.</summary>
    public static EpisodeExport Parse(string json)
    {
        ArgumentNullException.ThrowIfNull(json);
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(json);
        }
        catch (JsonException ex)
        {
            throw new FormatException($"episode export is not valid JSON: {ex.Message}", ex);
        }
        using (doc)
        {
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object || Str(root, "format", "") != Format)
            {
                throw new FormatException($"not an episode export: 'format' must be '{Format}'");
            }
            var episode = Obj(root, "episode", "");
            AerodromeProfile profile;
            try
            {
                profile = ProfileLoader.Parse(Obj(root, "profile", "").GetRawText());
            }
            catch (ProfileException ex)
            {
                throw new FormatException($"episode export 'profile': {ex.Message}", ex);
            }
            var readings = Arr(root, "readings").Select((r, i) =>
            {
                var at = $"readings[{i}]";
                var kindText = Str(r, "kind", at);
                var kind = Enum.GetValues<ReadingKind>().Where(k => ReadingsCsv.KindName(k) == kindText).Select(k => (ReadingKind?)k).FirstOrDefault()
                    ?? throw new FormatException($"{at}: unknown kind '{kindText}'");
                var statusText = Str(r, "status", at);
                var status = Enum.TryParse<ReadingStatus>(statusText, ignoreCase: true, out var s) ? s : throw new FormatException($"{at}: unknown status '{statusText}'");
                return new Reading(Time(r, "time", at), Str(r, "sensor", at), kind, Number(r, "value", at), status);
            }).ToList();
            var actions = Arr(root, "actions").Select((a, i) =>
            {
                var at = $"actions[{i}]";
                return new ActionRow(Time(a, "time", at), Str(a, "actor", at), Str(a, "action", at), Str(a, "target", at), Str(a, "value", at), Str(a, "reason", at));
            }).ToList();
            var events = Arr(root, "events").Select((e, i) =>
            {
                try
                {
                    return RecordedEvent.Parse(e.GetRawText());
                }
                catch (FormatException ex)
                {
                    throw new FormatException($"events[{i}]: {ex.Message}", ex);
                }
            }).ToList();
            var audit = Arr(root, "audit").Select((a, i) =>
            {
                var at = $"audit[{i}]";
                var seq = a.TryGetProperty("sequence", out var sq) && sq.ValueKind == JsonValueKind.Number && sq.TryGetInt64(out var n)
                    ? n
                    : throw new FormatException($"{at}: 'sequence' must be a whole number");
                var timeText = Str(a, "time", at);
                var time = DateTimeOffset.TryParseExact(timeText, AuditCanonical.TimeFormat, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal, out var t)
                    ? t
                    : throw new FormatException($"{at} (sequence {seq}): 'time' is not in the fixed format {AuditCanonical.TimeFormat}: '{timeText}'");
                return new AuditEntry(seq, time, Str(a, "actor", at), Str(a, "kind", at), Str(a, "payload_json", at), Str(a, "previous_hash", at), Str(a, "hash", at));
            }).ToList();
            var endText = episode.TryGetProperty("end", out var endElement) && endElement.ValueKind == JsonValueKind.String ? endElement.GetString() : null;
            var deepestText = Str(episode, "deepest_phase", "episode");
            return new EpisodeExport(
                Str(episode, "id", "episode"),
                Time(episode, "start", "episode"),
                endText is null ? null : Time(episode, "end", "episode"),
                Enum.TryParse<Phase>(deepestText, ignoreCase: true, out var deepest) ? deepest : throw new FormatException($"episode: unknown deepest_phase '{deepestText}'"),
                profile,
                readings,
                actions,
                events,
                audit,
                Time(episode, "replay_until", "episode"))
            {
                CapabilityAtStart = CapabilityExport.ReadAtStart(root),
            };
        }
    }

    /// <summary>
    /// Checks the exported audit entries as a chain segment (docs/review.md): consecutive sequences, each previous
    /// hash equal to the hash before it (the first entry's previous hash is taken as the anchor), each stored hash
    /// equal to the recomputed one. The result names the first bad entry.
    /// </summary>
    public AuditVerification VerifyAudit() => VerifySegment(Audit);

    /// <summary>Segment verification of <paramref name="entries"/> (see <see cref="VerifyAudit"/>).</summary>
    public static AuditVerification VerifySegment(IReadOnlyList<AuditEntry> entries)
    {
        ArgumentNullException.ThrowIfNull(entries);
        if (entries.Count == 0)
        {
            return new AuditVerification(0, true, null, null, "no audit entries", null);
        }
        // Same checks and order as AuditChainVerifier, except that the first entry's previous hash is the anchor
        // (the segment need not start at sequence 1); compare it with the full chain to prove the join.
        AuditEntry? previous = null;
        long? regression = null;
        for (var i = 0; i < entries.Count; i++)
        {
            var e = entries[i];
            if (previous is not null)
            {
                if (e.Sequence > previous.Sequence + 1)
                {
                    return Fail(i, previous.Sequence + 1, AuditFailure.SequenceGap, $"expected sequence {previous.Sequence + 1}, found {e.Sequence}", regression);
                }
                if (e.Sequence <= previous.Sequence)
                {
                    return Fail(i, e.Sequence, AuditFailure.SequenceDuplicate, $"sequence {e.Sequence} does not follow {previous.Sequence}", regression);
                }
                if (!string.Equals(e.PreviousHash, previous.Hash, StringComparison.Ordinal))
                {
                    return Fail(i, e.Sequence, AuditFailure.BrokenLink, $"entry {e.Sequence}: previous hash does not match the hash of entry {previous.Sequence}", regression);
                }
                if (e.Time < previous.Time)
                {
                    regression ??= e.Sequence;
                }
            }
            if (!AuditChain.IsHash(e.Hash) || !AuditChain.IsHash(e.PreviousHash))
            {
                return Fail(i, e.Sequence, AuditFailure.MalformedEntry, $"entry {e.Sequence}: hash is not 64 lowercase hex digits", regression);
            }
            string recomputed;
            try
            {
                recomputed = AuditChain.ComputeHash(e);
            }
            catch (ArgumentException ex)
            {
                return Fail(i, e.Sequence, AuditFailure.MalformedEntry, $"entry {e.Sequence}: {ex.Message.ReplaceLineEndings(" ")}", regression);
            }
            if (!string.Equals(recomputed, e.Hash, StringComparison.Ordinal))
            {
                return Fail(i, e.Sequence, AuditFailure.HashMismatch, $"entry {e.Sequence}: stored hash differs from the hash of the entry's content", regression);
            }
            previous = e;
        }
        return new AuditVerification(entries.Count, true, null, null, $"entries {entries[0].Sequence}–{previous!.Sequence} verify; head {previous.Hash}", regression);

        AuditVerification Fail(int index, long sequence, AuditFailure failure, string detail, long? reg) =>
            new(entries.Count, false, sequence, failure, detail, reg);
    }

    private static JsonElement Obj(JsonElement e, string name, string at) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.Object ? v : throw new FormatException($"{Where(at)}'{name}' must be an object");

    private static IEnumerable<JsonElement> Arr(JsonElement e, string name) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.Array ? v.EnumerateArray().ToList() : throw new FormatException($"'{name}' must be an array");

    private static string Str(JsonElement e, string name, string at) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString()! : throw new FormatException($"{Where(at)}'{name}' must be a string");

    private static double Number(JsonElement e, string name, string at) =>
        e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.Number ? v.GetDouble() : throw new FormatException($"{Where(at)}'{name}' must be a number");

    private static DateTimeOffset Time(JsonElement e, string name, string at)
    {
        var s = Str(e, name, at);
        return DateTimeOffset.TryParse(s, CultureInfo.InvariantCulture, DateTimeStyles.AdjustToUniversal, out var t) && s.EndsWith('Z')
            ? t
            : throw new FormatException($"{Where(at)}'{name}' is not an ISO 8601 UTC time: '{s}'");
    }

    private static string Where(string at) => at.Length == 0 ? "" : at + ": ";
}
