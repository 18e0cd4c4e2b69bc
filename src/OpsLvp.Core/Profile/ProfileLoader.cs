using System.Text.Json;
using System.Text.Json.Serialization;

namespace OpsLvp.Core.Profile;

/// <summary>Reads and writes <see cref="AerodromeProfile"/> JSON (camelCase names, enums as camelCase strings).</summary>
public static class ProfileLoader
{
    /// <summary>The serializer options every profile read and write uses.</summary>
    public static JsonSerializerOptions JsonOptions { get; } = CreateOptions();

    /// <summary>Parses profile JSON. Throws <see cref="ProfileException"/> with the JSON path on malformed input.</summary>
    public static AerodromeProfile Parse(string json)
    {
        try
        {
            return JsonSerializer.Deserialize<AerodromeProfile>(json, JsonOptions)
                ?? throw new ProfileException("$", "profile is empty");
        }
        catch (JsonException ex)
        {
            throw new ProfileException(ex.Path ?? "$", ex.Message);
        }
    }

    /// <summary>Reads a profile file. Throws <see cref="ProfileException"/> when it cannot be read or parsed.</summary>
    public static AerodromeProfile Load(string path)
    {
        string json;
        try
        {
            json = File.ReadAllText(path);
        }
        catch (IOException ex)
        {
            throw new ProfileException("$", $"cannot read profile '{path}': {ex.Message}");
        }
        return Parse(json);
    }

    /// <summary>Serialises a profile with the same options.</summary>
    public static string Serialize(AerodromeProfile profile) => JsonSerializer.Serialize(profile, JsonOptions);

    private static JsonSerializerOptions CreateOptions()
    {
        var options = new JsonSerializerOptions(JsonSerializerDefaults.Web)
        {
            WriteIndented = true,
            ReadCommentHandling = JsonCommentHandling.Skip,
            AllowTrailingCommas = true,
            UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
        };
        options.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.CamelCase, allowIntegerValues: false));
        options.MakeReadOnly(populateMissingResolver: true);
        return options;
    }
}
