using System.Text.Json;

namespace OpsLvp.FaultCases;

/// <summary>
/// Judges the server's answer to a <see cref="HostileBody"/> (docs/reliability.md "Fault runs"): a 4xx the body allows,
/// with a JSON <c>error</c> naming the reason; or a 202 the body allows, whose <c>items</c> give one result per item in
/// request order, accepted where the item is good and rejected with a reason and a detail where it is not. Anything
/// else (a 5xx above all) is a break.
/// </summary>
public static class HostileAnswer
{
    /// <summary>Null when the answer is correct, else why it is not.</summary>
    public static string? Check(HostileBody body, int status, string responseText)
    {
        ArgumentNullException.ThrowIfNull(body);
        if (status >= 500)
        {
            return $"answered {status}: {Clip(responseText)}";
        }
        if (body.RefusedWith is { } refused && refused.Contains(status))
        {
            return HasReason(responseText) ? null : $"answered {status} without a reason: {Clip(responseText)}";
        }
        if (status == 202 && body.ExpectedItems is { } expected)
        {
            return CheckItems(expected, responseText);
        }
        var wanted = string.Join(" or ", (body.RefusedWith ?? []).Select(s => s.ToString(System.Globalization.CultureInfo.InvariantCulture))
            .Concat(body.ExpectedItems is null ? [] : ["202"]));
        return $"answered {status}, expected {wanted}: {Clip(responseText)}";
    }

    private static string? CheckItems(IReadOnlyList<bool> expected, string responseText)
    {
        JsonElement root;
        try
        {
            using var document = JsonDocument.Parse(responseText);
            root = document.RootElement.Clone();
        }
        catch (JsonException ex)
        {
            return $"202 body is not JSON: {ex.Message}";
        }
        if (!root.TryGetProperty("items", out var items) || items.ValueKind != JsonValueKind.Array)
        {
            return $"202 without an items array: {Clip(responseText)}";
        }
        if (items.GetArrayLength() != expected.Count)
        {
            return $"202 with {items.GetArrayLength()} item results for {expected.Count} items";
        }
        var i = 0;
        foreach (var item in items.EnumerateArray())
        {
            if (!item.TryGetProperty("index", out var index) || index.GetInt32() != i)
            {
                return $"item result {i} is not for item {i}: {Clip(item.ToString())}";
            }
            var outcome = item.TryGetProperty("outcome", out var o) ? o.GetString() : null;
            var want = expected[i] ? "accepted" : "rejected";
            if (outcome != want)
            {
                return $"item {i} {outcome ?? "(no outcome)"}, expected {want}: {Clip(item.ToString())}";
            }
            if (!expected[i] && (!NonEmpty(item, "reason") || !NonEmpty(item, "detail")))
            {
                return $"item {i} rejected without a reason and a detail: {Clip(item.ToString())}";
            }
            i++;
        }
        var accepted = expected.Count(e => e);
        return root.TryGetProperty("accepted", out var a) && a.GetInt32() == accepted
            ? null
            : $"202 says accepted {(root.TryGetProperty("accepted", out var b) ? b.ToString() : "(missing)")}, expected {accepted}";
    }

    private static bool HasReason(string responseText)
    {
        try
        {
            using var document = JsonDocument.Parse(responseText);
            return document.RootElement.ValueKind == JsonValueKind.Object && NonEmpty(document.RootElement, "error");
        }
        catch (JsonException)
        {
            return false;
        }
    }

    private static bool NonEmpty(JsonElement element, string name) =>
        element.TryGetProperty(name, out var value) && value.ValueKind == JsonValueKind.String && !string.IsNullOrWhiteSpace(value.GetString());

    private static string Clip(string text) => text.Length <= 200 ? text : string.Concat(text.AsSpan(0, 200), "…");
}
