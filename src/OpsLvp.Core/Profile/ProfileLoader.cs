using System.Text.Json;
using System.Text.Json.Serialization;
using System.Text.RegularExpressions;

namespace OpsLvp.Core.Profile;

/// <summary>Reads and writes <see cref="AerodromeProfile"/> JSON (camelCase names, enums as camelCase strings).</summary>
public static partial class ProfileLoader
{
    /// <summary>The serializer options every profile read and write uses.</summary>
    public static JsonSerializerOptions JsonOptions { get; } = CreateOptions();

    /// <summary>
    /// Parses profile JSON. Throws <see cref="ProfileException"/> whose field is the JSON path at fault
    /// (<c>sensors[2].type</c>, without the leading <c>$.</c>) on malformed input: bad syntax, an unknown
    /// property, an unknown enum value, a wrong value type, a missing required member or a null where a
    /// value is required. Does not apply <see cref="ProfileValidator"/>; use <see cref="ProfileValidator.ParseValidated"/>.
    /// </summary>
    public static AerodromeProfile Parse(string json)
    {
        ArgumentNullException.ThrowIfNull(json);
        try
        {
            return JsonSerializer.Deserialize<AerodromeProfile>(json, JsonOptions)
                ?? throw new ProfileException("$", "profile is empty; expected a JSON object");
        }
        catch (JsonException ex)
        {
            throw new ProfileException(FieldOf(ex.Path), Describe(ex));
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
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException)
        {
            throw new ProfileException("$", $"cannot read profile '{path}': {ex.Message}");
        }
        return Parse(json);
    }

    /// <summary>Serialises a profile with the same options.</summary>
    public static string Serialize(AerodromeProfile profile) => JsonSerializer.Serialize(profile, JsonOptions);

    private static string FieldOf(string? jsonPath)
    {
        if (string.IsNullOrEmpty(jsonPath) || jsonPath == "$")
        {
            return "$";
        }
        return jsonPath.StartsWith("$.", StringComparison.Ordinal) ? jsonPath[2..] : jsonPath.TrimStart('$');
    }

    private static string Describe(JsonException ex)
    {
        var where = ex.LineNumber is { } line ? $" (line {line + 1})" : "";
        var message = ex.Message;
        var unknownProperty = UnknownPropertyPattern().Match(message);
        if (unknownProperty.Success)
        {
            return $"unknown property '{unknownProperty.Groups[1].Value}'{where}; docs/profile.md lists the fields";
        }
        var converted = ConvertedToPattern().Match(message);
        if (converted.Success)
        {
            var target = TargetType(converted.Groups[1].Value, ex.Path);
            if (target is { IsEnum: true })
            {
                var names = Enum.GetNames(target).Select(n => $"'{JsonNamingPolicy.CamelCase.ConvertName(n)}'");
                return $"unknown value{where}; expected one of {string.Join(", ", names)}";
            }
            return $"wrong value type{where}; expected {FriendlyType(target)}";
        }
        var missing = MissingRequiredPattern().Match(message);
        if (missing.Success)
        {
            return $"missing required property {missing.Groups[1].Value}{where}";
        }
        // Syntax errors and the rest: keep the serializer's text, which names the position.
        return message;
    }

    /// <summary>
    /// The type the serializer failed to produce. For constructor parameters it names the declaring record,
    /// so the last path segment is looked up on it to find the member's own type.
    /// </summary>
    private static Type? TargetType(string clrName, string? path)
    {
        var type = typeof(ProfileLoader).Assembly.GetType(clrName) ?? Type.GetType(clrName);
        if (type is null || type.IsEnum || path is null)
        {
            return type;
        }
        var last = path[(path.LastIndexOf('.') + 1)..];
        var bracket = last.IndexOf('[', StringComparison.Ordinal);
        var isElement = bracket >= 0;
        if (isElement)
        {
            last = last[..bracket];
        }
        var property = type.GetProperties().FirstOrDefault(p => string.Equals(p.Name, last, StringComparison.OrdinalIgnoreCase));
        if (property is null)
        {
            return type;
        }
        var memberType = Nullable.GetUnderlyingType(property.PropertyType) ?? property.PropertyType;
        if (isElement && memberType.IsGenericType)
        {
            memberType = memberType.GetGenericArguments()[0];
        }
        return memberType;
    }

    private static string FriendlyType(Type? type)
    {
        if (type is null)
        {
            return "a value of another type";
        }
        type = Nullable.GetUnderlyingType(type) ?? type;
        if (type == typeof(string))
        {
            return "a string";
        }
        if (type == typeof(int) || type == typeof(long))
        {
            return "a whole number";
        }
        if (type == typeof(double))
        {
            return "a number";
        }
        if (type == typeof(bool))
        {
            return "true or false";
        }
        if (type.IsGenericType && type.GetGenericTypeDefinition() == typeof(IReadOnlyList<>))
        {
            return "an array";
        }
        return "an object";
    }

    [GeneratedRegex(@"The JSON property '([^']*)' could not be mapped")]
    private static partial Regex UnknownPropertyPattern();

    [GeneratedRegex(@"could not be converted to ([^\s]+?)\.? Path:")]
    private static partial Regex ConvertedToPattern();

    [GeneratedRegex(@"missing required properties including: (.+?)\.?$")]
    private static partial Regex MissingRequiredPattern();

    private static JsonSerializerOptions CreateOptions()
    {
        var options = new JsonSerializerOptions(JsonSerializerDefaults.Web)
        {
            WriteIndented = true,
            ReadCommentHandling = JsonCommentHandling.Skip,
            AllowTrailingCommas = true,
            UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
            // Records' positional parameters (sensor id, runway directions…) must be present and non-null,
            // so a missing id is a parse error naming the field rather than a null the engine trips over.
            RespectRequiredConstructorParameters = true,
            RespectNullableAnnotations = true,
        };
        options.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.CamelCase, allowIntegerValues: false));
        options.MakeReadOnly(populateMissingResolver: true);
        return options;
    }
}
