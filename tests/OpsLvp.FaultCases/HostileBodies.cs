using System.Globalization;
using System.Text;

namespace OpsLvp.FaultCases;

/// <summary>
/// Generates hostile push bodies for <c>POST /api/readings</c> (docs/reliability.md "Fault runs"), each with the answer
/// that is correct for it, from the push contract in docs/feeds.md ("What ingest refuses") and the engine's screening
/// (docs/engine.md R1): duplicate names, invalid UTF-8, raw and escaped control characters, huge arrays and bodies,
/// deep nesting, wrong shapes and kinds, unknown sensors, out-of-range values, future times, non-ok statuses, wrong
/// content types, missing keys. Body <c>i</c> of seed <c>s</c> is always the same bytes apart from the times, which
/// are relative to the <c>now</c> given. Sensor ids, values and times are invented.
/// </summary>
public static class HostileBodies
{
    /// <summary>The largest body the server accepts (<c>Feeds:Push:MaxBodyBytes</c>, default).</summary>
    public const int MaxBodyBytes = 256 * 1024;

    /// <summary>The most readings the server accepts in one body (<c>Feeds:Push:MaxReadings</c>, default).</summary>
    public const int MaxReadings = 500;

    private static readonly int[] s_badRequest = [400];
    private static readonly int[] s_tooLarge = [413];
    private static readonly int[] s_unauthorized = [401];
    private static readonly int[] s_unsupportedType = [415];

    private static readonly (string Name, Func<Random, DateTimeOffset, HostileBody> Make)[] s_cases =
    [
        ("valid", Valid),
        ("mixed-items", Mixed),
        ("duplicate-document-key", DuplicateDocumentKey),
        ("invalid-utf8", InvalidUtf8),
        ("raw-control-character", RawControlCharacter),
        ("too-many-readings", TooManyReadings),
        ("oversized-body", OversizedBody),
        ("deep-nesting", DeepNesting),
        ("wrong-shape", WrongShape),
        ("not-json", NotJson),
        ("missing-or-wrong-key", MissingOrWrongKey),
        ("wrong-content-type", WrongContentType),
        ("lone-surrogate", LoneSurrogate),
    ];

    /// <summary>The case names, in the order bodies cycle through them.</summary>
    public static IReadOnlyList<string> Cases { get; } = s_cases.Select(c => c.Name).ToArray();

    /// <summary>Body number <paramref name="index"/> of <paramref name="seed"/>: case <c>index % Cases.Count</c>.</summary>
    public static HostileBody Make(int seed, long index, DateTimeOffset now)
    {
        var random = new Random(HashCode.Combine(seed, index));
        return s_cases[(int)(index % s_cases.Length)].Make(random, now);
    }

    private static HostileBody Valid(Random r, DateTimeOffset now)
    {
        var items = Enumerable.Range(0, r.Next(0, 21)).Select(_ => ValidItem(r, now)).ToList();
        return Accepted("valid", Document(items.Select(i => i.Json)), items.Select(i => i.Accept));
    }

    private static HostileBody Mixed(Random r, DateTimeOffset now)
    {
        var items = Enumerable.Range(0, r.Next(1, 31)).Select(_ => r.Next(10) < 4 ? ValidItem(r, now) : BadItem(r, now)).ToList();
        return Accepted("mixed-items", Document(items.Select(i => i.Json)), items.Select(i => i.Accept));
    }

    private static HostileBody DuplicateDocumentKey(Random r, DateTimeOffset now)
    {
        var first = ValidItem(r, now).Json;
        var second = ValidItem(r, now).Json;
        var name = r.Next(2) == 0 ? "readings" : "readin\\u0067s"; // the same name once unescaped
        var json = r.Next(3) switch
        {
            0 => $"{{\"readings\":[{first}],\"{name}\":[{second}]}}",
            1 => $"{{\"readings\":[{first}],\"extra\":1,\"extra\":2}}",
            _ => $"{{\"{name}\":[],\"readings\":[{first}]}}",
        };
        return Refused("duplicate-document-key", Encoding.UTF8.GetBytes(json), s_badRequest);
    }

    private static HostileBody InvalidUtf8(Random r, DateTimeOffset now)
    {
        byte[][] bad = [[0xFF], [0xC3, 0x28], [0xC0, 0xAF], [0xED, 0xA0, 0x80], [0xF4, 0x90, 0x80, 0x80], [0xE2, 0x82], [0x80], [0xF8, 0x88, 0x80, 0x80, 0x80]];
        var body = Encoding.UTF8.GetBytes(Document([ValidItem(r, now).Json, ValidItem(r, now).Json]));
        var sequence = bad[r.Next(bad.Length)];
        // inside the first sensor id, or anywhere
        var at = r.Next(2) == 0 ? InsideFirstSensorId(body) : r.Next(body.Length + 1);
        return Refused("invalid-utf8", [.. body.AsSpan(0, at), .. sequence, .. body.AsSpan(at)], s_badRequest);
    }

    private static HostileBody RawControlCharacter(Random r, DateTimeOffset now)
    {
        var body = Encoding.UTF8.GetBytes(Document([ValidItem(r, now).Json]));
        var control = (byte)r.Next(0, 0x20);
        var at = InsideFirstSensorId(body) + r.Next(2); // inside the sensor id string: unescaped control characters are not JSON
        return Refused("raw-control-character", [.. body.AsSpan(0, at), control, .. body.AsSpan(at)], s_badRequest);
    }

    private static HostileBody TooManyReadings(Random r, DateTimeOffset now)
    {
        var count = MaxReadings + 1 + r.Next(0, 1500);
        var json = r.Next(2) == 0
            ? Document(Enumerable.Range(0, count).Select(_ => "0")) // a huge array of numbers
            : Document(Enumerable.Range(0, count).Select(_ => ValidItem(r, now).Json));
        var body = Encoding.UTF8.GetBytes(json);
        // a body over the byte limit is refused for that first; both are 413
        return Refused("too-many-readings", body, s_tooLarge);
    }

    private static HostileBody OversizedBody(Random r, DateTimeOffset now)
    {
        var size = MaxBodyBytes + 1 + r.Next(0, 3 * MaxBodyBytes);
        var prefix = $"{{\"readings\":[{ValidItem(r, now).Json}],\"pad\":\"";
        var body = new byte[size];
        Encoding.UTF8.GetBytes(prefix).CopyTo(body, 0);
        body.AsSpan(prefix.Length, size - prefix.Length - 2).Fill((byte)'a');
        "\"}"u8.CopyTo(body.AsSpan(size - 2));
        return Refused("oversized-body", body, s_tooLarge) with { Chunked = r.Next(2) == 0 };
    }

    private static HostileBody DeepNesting(Random r, DateTimeOffset now)
    {
        var depth = r.Next(3) == 0 ? r.Next(17, 64) : r.Next(64, 100_000);
        string json;
        if (r.Next(2) == 0)
        {
            json = "{\"readings\":" + new string('[', depth) + new string(']', depth) + "}";
        }
        else
        {
            depth = Math.Min(depth, 30_000); // 6 bytes a level: stays under the body limit, so the answer is about the depth
            var open = string.Concat(Enumerable.Repeat("{\"a\":", depth));
            json = "{\"readings\":[" + ValidItem(r, now).Json + "],\"x\":" + open + "1" + new string('}', depth) + "}";
        }
        return Refused("deep-nesting", Encoding.UTF8.GetBytes(json), s_badRequest);
    }

    private static HostileBody WrongShape(Random r, DateTimeOffset now)
    {
        string[] shapes =
        [
            "[]", "\"readings\"", "42", "null", "true", "{}", "{\"readings\":{}}", "{\"readings\":\"x\"}", "{\"readings\":null}",
            "{\"readings\":1}", "{\"Readings\":[]}", "[" + ValidItem(r, now).Json + "]",
        ];
        return Refused("wrong-shape", Encoding.UTF8.GetBytes(shapes[r.Next(shapes.Length)]), s_badRequest);
    }

    private static HostileBody NotJson(Random r, DateTimeOffset now)
    {
        var valid = Document([ValidItem(r, now).Json, ValidItem(r, now).Json]);
        byte[] body;
        switch (r.Next(7))
        {
            case 0:
                body = Encoding.UTF8.GetBytes(valid[..r.Next(0, valid.Length)]); // truncated (empty included)
                break;
            case 1:
                body = new byte[r.Next(1, 2048)];
                r.NextBytes(body);
                if (body[0] is (byte)'{' or (byte)'[' or (byte)'"' or (byte)' ' or (byte)'\t' or (byte)'\r' or (byte)'\n' or (>= (byte)'0' and <= (byte)'9') or (byte)'-' or (byte)'t' or (byte)'f' or (byte)'n')
                {
                    body[0] = (byte)'#'; // never a JSON start, so random bytes cannot be a valid document by chance
                }
                break;
            case 2:
                body = Encoding.UTF8.GetBytes("// comment\n" + valid);
                break;
            case 3:
                body = Encoding.UTF8.GetBytes(valid.Replace("]}", ",]}", StringComparison.Ordinal)); // trailing comma
                break;
            case 4:
                body = Encoding.UTF8.GetBytes(valid.Replace('"', '\''));
                break;
            case 5:
                body = Encoding.UTF8.GetBytes(valid.Replace("\"value\":", "\"value\":NaN,\"v\":", StringComparison.Ordinal));
                break;
            default:
                body = Encoding.UTF8.GetBytes(valid + valid); // two documents
                break;
        }
        return Refused("not-json", body, s_badRequest);
    }

    private static HostileBody MissingOrWrongKey(Random r, DateTimeOffset now)
    {
        var body = Encoding.UTF8.GetBytes(Document([ValidItem(r, now).Json]));
        return new HostileBody("missing-or-wrong-key", body, "application/json", false, null, s_unauthorized);
    }

    private static HostileBody WrongContentType(Random r, DateTimeOffset now)
    {
        string?[] types = ["text/plain", "application/xml", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", null, "application/json; charset=latin1"];
        var items = Enumerable.Range(0, r.Next(1, 6)).Select(_ => ValidItem(r, now)).ToList();
        // the body is what counts: reading it as the JSON it is (202) or refusing the type (415) are both correct
        return new HostileBody("wrong-content-type", Encoding.UTF8.GetBytes(Document(items.Select(i => i.Json))), types[r.Next(types.Length)], true,
            items.Select(i => i.Accept).ToArray(), s_unsupportedType);
    }

    private static HostileBody LoneSurrogate(Random r, DateTimeOffset now)
    {
        string[] escapes = ["\\ud800", "\\udfff", "\\ud83d", "\\udc00\\ud800"];
        var escape = escapes[r.Next(escapes.Length)];
        var valid = ValidItem(r, now);
        var t = Time(now.AddSeconds(-1));
        var variant = r.Next(4);
        if (variant == 3)
        {
            // in a name of the document: the document is refused
            var document = $"{{\"{escape}\":1,\"readings\":[{valid.Json}]}}";
            return Refused("lone-surrogate", Encoding.UTF8.GetBytes(document), s_badRequest);
        }
        var item = variant switch
        {
            0 => Item(t, "f-" + escape, "rvr", "900", "ok"),
            1 => Item(t + escape, FaultProfile.Tdz, "rvr", "900", "ok"),
            _ => $"{{\"time\":\"{t}\",\"sensor\":\"{FaultProfile.Tdz}\",\"kind\":\"rvr\",\"value\":900,\"status\":\"ok\",\"n{escape}\":1}}", // in an item's name
        };
        // the item rejected with a reason (202), or the document refused (400): both correct, a 500 is not
        return new HostileBody("lone-surrogate", Encoding.UTF8.GetBytes(Document([valid.Json, item])), "application/json", true,
            [valid.Accept, false], s_badRequest);
    }

    /// <summary>A reading the server must accept: a known sensor, a kind it produces, in range, status ok, not in the future.</summary>
    private static (string Json, bool Accept) ValidItem(Random r, DateTimeOffset now)
    {
        var time = now.AddMilliseconds(-r.Next(0, 300_000));
        var (sensor, kind, max) = r.Next(5) switch
        {
            0 => (FaultProfile.Tdz, "visibility", 100_000),
            1 => (FaultProfile.Mid, "extinction", 1_000),
            2 => (FaultProfile.Mid, "rvr", 10_000),
            3 => (FaultProfile.Mid, "visibility", 100_000),
            _ => (FaultProfile.Tdz, "rvr", 10_000),
        };
        var value = r.Next(6) switch
        {
            0 => "0",
            1 => max.ToString(CultureInfo.InvariantCulture),
            2 => (r.NextDouble() * max).ToString("0.###", CultureInfo.InvariantCulture),
            3 => (r.Next(1, max / 10) / 100.0).ToString("0.##e0", CultureInfo.InvariantCulture),
            4 => "1e-400", // underflows to 0, which is in range
            _ => r.Next(0, max + 1).ToString(CultureInfo.InvariantCulture),
        };
        var timeText = r.Next(4) == 0 ? time.ToOffset(TimeSpan.FromHours(r.Next(-12, 15))).ToString("yyyy-MM-dd'T'HH:mm:sszzz", CultureInfo.InvariantCulture) : Time(time);
        var sensorText = r.Next(10) == 0 ? sensor.Replace("-", "\\u002d", StringComparison.Ordinal) : sensor; // escaped, same id
        return (Item(timeText, sensorText, kind, value, "ok"), true);
    }

    /// <summary>A reading the server must reject with a reason (parser or engine screening).</summary>
    private static (string Json, bool Accept) BadItem(Random r, DateTimeOffset now)
    {
        var t = Time(now.AddSeconds(-r.Next(0, 300)));
        var json = r.Next(24) switch
        {
            0 => Item(t, "x-" + r.Next(100_000).ToString(CultureInfo.InvariantCulture), "rvr", "900", "ok"), // unknown sensor
            1 => Item(t, FaultProfile.Tdz, "extinction", "5", "ok"), // kind the sensor does not produce
            2 => Item(t, FaultProfile.Mid, "cloud_base", "500", "ok"),
            3 => Item(t, FaultProfile.Tdz, "rvr", "900", new[] { "degraded", "failed", "maintenance" }[r.Next(3)]),
            4 => Item(t, FaultProfile.Tdz, "rvr", new[] { "-1", "10000.5", "1e9", "-0.001" }[r.Next(4)], "ok"), // out of range
            5 => Item(t, FaultProfile.Mid, "extinction", "1000.01", "ok"),
            6 => Item(Time(now.AddSeconds(r.Next(60, 400_000_000))), FaultProfile.Tdz, "rvr", "900", "ok"), // future
            7 => Item(t, FaultProfile.Tdz, "rvr", "\"900\"", "ok"), // value as a string
            8 => Item(t, FaultProfile.Tdz, "rvr", new[] { "null", "true", "[]", "{}" }[r.Next(4)], "ok"),
            9 => Item(t, FaultProfile.Tdz, "rvr", "1e400", "ok"), // not representable
            10 => Item(now.AddSeconds(-1).UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss", CultureInfo.InvariantCulture), FaultProfile.Tdz, "rvr", "900", "ok"), // no offset
            11 => Item(t[..5] + "02-30T00:00:00Z", FaultProfile.Tdz, "rvr", "900", "ok"), // no such date
            12 => Item(t.Insert(r.Next(t.Length), "\\u00" + r.Next(0, 0x20).ToString("x2", CultureInfo.InvariantCulture)), FaultProfile.Tdz, "rvr", "900", "ok"), // escaped control character in the time
            13 => Item(t, "f-" + "\\u00" + r.Next(0, 0x20).ToString("x2", CultureInfo.InvariantCulture) + "tdz", "rvr", "900", "ok"), // ... in the sensor id
            14 => Item(t, "f-\\u0085tdz", "rvr", "900", "ok"), // C1 control
            15 => Item(t, new string('s', r.Next(33, 20_000)), "rvr", "900", "ok"), // id too long
            16 => Item(t, FaultProfile.Tdz, new[] { "RVR", "Rvr", "rvr ", "", "mor" }[r.Next(5)], "900", "ok"),
            17 => Item(t, FaultProfile.Tdz, "rvr", "900", new[] { "OK", "", "good" }[r.Next(3)]),
            18 => $"{{\"time\":\"{t}\",\"sensor\":\"{FaultProfile.Tdz}\",\"kind\":\"rvr\",\"value\":1800,\"value\":100,\"status\":\"ok\"}}", // duplicate name
            19 => $"{{\"time\":\"{t}\",\"sensor\":\"{FaultProfile.Tdz}\",\"kind\":\"rvr\",\"value\":1800,\"valu\\u0065\":100,\"status\":\"ok\"}}", // the same, escaped
            20 => new[] { "1", "\"x\"", "[]", "null", "true" }[r.Next(5)], // not an object
            21 => $"{{\"time\":\"{t}\",\"sensor\":\"{FaultProfile.Tdz}\",\"kind\":\"rvr\",\"status\":\"ok\"}}", // value missing
            22 => Item(t, "f tdz", "rvr", "900", "ok"), // a character ids do not have
            _ => Item(new[] { "", "yesterday", "2026-13-01T00:00:00Z", "0000-00-00T00:00:00Z" }[r.Next(4)], FaultProfile.Tdz, "rvr", "900", "ok"),
        };
        return (json, false);
    }

    private static string Item(string time, string sensor, string kind, string value, string status) =>
        $"{{\"time\":\"{time}\",\"sensor\":\"{sensor}\",\"kind\":\"{kind}\",\"value\":{value},\"status\":\"{status}\"}}";

    private static string Time(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", CultureInfo.InvariantCulture);

    private static string Document(IEnumerable<string> items) => "{\"readings\":[" + string.Join(",", items) + "]}";

    private static HostileBody Accepted(string name, string json, IEnumerable<bool> expected) =>
        new(name, Encoding.UTF8.GetBytes(json), "application/json", true, expected.ToArray(), null);

    private static HostileBody Refused(string name, byte[] body, int[] statuses) => new(name, body, "application/json", true, null, statuses);

    /// <summary>The offset just after the first character of the first sensor id (outside strings a tab or a line end is only whitespace).</summary>
    private static int InsideFirstSensorId(byte[] body) => body.AsSpan().IndexOf("\"sensor\":\""u8) + "\"sensor\":\"".Length + 1;
}
