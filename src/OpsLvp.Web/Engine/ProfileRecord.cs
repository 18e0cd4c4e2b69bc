using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using OpsLvp.Core.Audit;
using OpsLvp.Core.Profile;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Engine;

/// <summary>
/// The <c>profile_loaded</c> audit entry: the whole profile the engine runs under, recorded at start whenever it
/// differs from the last one recorded (by SHA-256 of its normalised JSON, so a changed file with an unchanged version
/// string is recorded too). The review reads it back to judge each episode by the thresholds then in force.
/// Payload: <c>{"version": …, "sha256": …, "profile": {…}}</c>.
/// </summary>
public static class ProfileRecord
{
    public const string Kind = "profile_loaded";

    /// <summary>Lowercase hex SHA-256 of the profile as <see cref="ProfileLoader.Serialize"/> writes it.</summary>
    public static string Sha256(AerodromeProfile profile) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(ProfileLoader.Serialize(profile))));

    public static NewAuditEntry Entry(AerodromeProfile profile, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(profile);
        var payload = new JsonObject
        {
            ["version"] = profile.Version,
            ["sha256"] = Sha256(profile),
            ["profile"] = JsonNode.Parse(ProfileLoader.Serialize(profile)),
        };
        return new NewAuditEntry(AuditEvents.EngineActor, Kind, payload.ToJsonString(), at);
    }

    /// <summary>The SHA-256 an entry records, or null when the entry is not a readable profile record.</summary>
    public static string? ShaOf(AuditEntry entry) =>
        Read(entry, "sha256", JsonValueKind.String, v => v.GetString());

    /// <summary>The profile an entry records, or null when the entry is not a profile record or cannot be read as a valid profile.</summary>
    public static AerodromeProfile? ProfileOf(AuditEntry entry)
    {
        try
        {
            return Read(entry, "profile", JsonValueKind.Object, v => ProfileValidator.ParseValidated(v.GetRawText()));
        }
        catch (ProfileException)
        {
            return null;
        }
    }

    /// <summary>A field of a profile record's payload object, or null (not a profile record, not an object, no such field of that kind).</summary>
    private static T? Read<T>(AuditEntry entry, string field, JsonValueKind kind, Func<JsonElement, T?> read)
        where T : class
    {
        ArgumentNullException.ThrowIfNull(entry);
        if (entry.Kind != Kind)
        {
            return null;
        }
        try
        {
            using var doc = JsonDocument.Parse(entry.PayloadJson);
            return doc.RootElement.ValueKind == JsonValueKind.Object && doc.RootElement.TryGetProperty(field, out var value) && value.ValueKind == kind
                ? read(value)
                : null;
        }
        catch (JsonException)
        {
            return null;
        }
    }
}
