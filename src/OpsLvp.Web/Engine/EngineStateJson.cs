using System.Text.Json;
using System.Text.Json.Serialization;
using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Engine;

/// <summary>How the engine state is written to and read from the <c>engine_state</c> row.</summary>
public static class EngineStateJson
{
    public static JsonSerializerOptions Options { get; } = new(JsonSerializerDefaults.General)
    {
        Converters = { new JsonStringEnumConverter() },
    };

    public static string Serialize(EngineState state) => JsonSerializer.Serialize(state, Options);

    /// <exception cref="JsonException">The text is not a serialised engine state.</exception>
    public static EngineState Deserialize(string json) =>
        JsonSerializer.Deserialize<EngineState>(json, Options) ?? throw new JsonException("engine state JSON is null");
}
