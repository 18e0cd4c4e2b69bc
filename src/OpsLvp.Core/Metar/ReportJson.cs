using System.Text;
using System.Text.Json;
using OpsLvp.Core.Reporting;

namespace OpsLvp.Core.Metar;

/// <summary>
/// The JSON pieces the METAR and TAF writers share (<see cref="MetarJson"/>, <see cref="Forecast.TafJson"/>): the
/// writer itself, nullable numbers, string arrays, the <c>M</c>/<c>P</c> qualifier codes and the cloud layers, so a
/// decoded cloud group reads the same in both outputs (docs/cli.md).
/// </summary>
internal static class ReportJson
{
    /// <summary>Runs <paramref name="write"/> on a fresh writer and returns the UTF-8 text (compact unless <paramref name="indented"/>).</summary>
    public static string Build(bool indented, Action<Utf8JsonWriter> write)
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = indented }))
        {
            write(w);
        }
        return Encoding.UTF8.GetString(stream.ToArray());
    }

    /// <summary>A number, or JSON null when there is none.</summary>
    public static void Number(Utf8JsonWriter w, string name, double? value)
    {
        if (value is { } v)
        {
            w.WriteNumber(name, v);
        }
        else
        {
            w.WriteNull(name);
        }
    }

    public static void Strings(Utf8JsonWriter w, string name, IEnumerable<string> values)
    {
        w.WriteStartArray(name);
        foreach (var v in values)
        {
            w.WriteStringValue(v);
        }
        w.WriteEndArray();
    }

    /// <summary>"M" for less than, "P" for more than, as written in the report; null otherwise.</summary>
    public static string? Code(RvrQualifier? qualifier) => qualifier switch
    {
        RvrQualifier.Below => "M",
        RvrQualifier.Above => "P",
        _ => null,
    };

    /// <summary><c>"clouds": [{ "cover", "base_ft", "type" }, …]</c> with the report's codes (<c>"BKN"</c>, <c>"CB"</c>).</summary>
    public static void Clouds(Utf8JsonWriter w, IEnumerable<MetarCloudLayer> layers)
    {
        w.WriteStartArray("clouds");
        foreach (var layer in layers)
        {
            w.WriteStartObject();
            w.WriteString("cover", layer.Cover switch
            {
                CloudCover.Few => "FEW",
                CloudCover.Scattered => "SCT",
                CloudCover.Broken => "BKN",
                CloudCover.Overcast => "OVC",
                _ => null,
            });
            Number(w, "base_ft", layer.Base?.Value);
            w.WriteString("type", layer.Type switch
            {
                CloudType.Cumulonimbus => "CB",
                CloudType.ToweringCumulus => "TCU",
                _ => null,
            });
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }
}
