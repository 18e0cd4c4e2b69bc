using System.Buffers;
using System.Globalization;
using System.Text;
using System.Text.Json;
using OpsLvp.Core.Optics;
using OpsLvp.Core.Units;

namespace OpsLvp.Cli.Commands;

/// <summary>
/// <c>opslvp rvr</c> (docs/cli.md): one RVR assessment from MOR, σ or T+b, light intensity and background luminance
/// or period. Output <c>{ "mor_m", "lights_m", "object_m", "rvr_m", "report", "luminance_unknown" }</c>; the four
/// distances are the unrounded values rounded DOWN to 0.1 m (so a shown value never exceeds the assessed one), the
/// report is the Annex 3 reported value of the unrounded RVR. With neither luminance nor period the threshold that
/// gives the lowest lights range is used, as the server does (docs/engine.md R19), and <c>luminance_unknown</c> is true.
/// </summary>
public sealed class RvrCommand : ICliCommand
{
    private static readonly string[] _valueOptions =
    [
        "--mor-m", "--extinction-per-km", "--transmittance", "--baseline-m",
        "--light-intensity-cd", "--background-luminance", "--period",
    ];

    private const string ContinuousFlag = "--continuous-threshold";

    /// <inheritdoc />
    public IReadOnlyList<string> Path { get; } = ["rvr"];

    /// <inheritdoc />
    public string Usage =>
        "rvr (--mor-m M | --extinction-per-km S | --transmittance T --baseline-m B) --light-intensity-cd I "
        + "[--background-luminance CD_PER_M2 | --period night|intermediate|day|bright] [--continuous-threshold] "
        + "-> {mor_m, lights_m, object_m, rvr_m (metres, rounded down to 0.1), report (\"0550\", \"M0050\", \"P2000\"), "
        + "luminance_unknown}; periods stand for 1, 200, 4000, 20000 cd/m2; with neither, luminance is unknown and the "
        + "bright-day threshold (lowest lights range) is used";

    /// <inheritdoc />
    public int Run(IReadOnlyList<string> args, TextWriter stdout, TextWriter stderr)
    {
        if (args.Any(a => a is "--help" or "-h"))
        {
            stdout.WriteLine("usage: opslvp " + Usage);
            return 0;
        }
        var options = Parse(args, out var continuous);

        var atmosphere = new[] { "--mor-m", "--extinction-per-km", "--transmittance" }.Where(options.ContainsKey).ToList();
        if (atmosphere.Count != 1)
        {
            throw new CliUsageException(atmosphere.Count == 0
                ? "give one of --mor-m, --extinction-per-km, or --transmittance with --baseline-m"
                : $"give only one of --mor-m, --extinction-per-km, --transmittance (got {string.Join(", ", atmosphere)})");
        }
        if (options.ContainsKey("--transmittance") != options.ContainsKey("--baseline-m"))
        {
            throw new CliUsageException("--transmittance and --baseline-m go together");
        }
        if (!options.ContainsKey("--light-intensity-cd"))
        {
            throw new CliUsageException("missing --light-intensity-cd");
        }
        var hasLuminance = options.ContainsKey("--background-luminance");
        var hasPeriod = options.ContainsKey("--period");
        if (hasLuminance && hasPeriod)
        {
            throw new CliUsageException("give --background-luminance or --period, not both");
        }
        var luminanceUnknown = !hasLuminance && !hasPeriod;

        var inputs = new RvrInputs
        {
            Mor = options.TryGetValue("--mor-m", out var mor) ? new Metres(Positive("--mor-m", mor)) : null,
            Extinction = options.TryGetValue("--extinction-per-km", out var sigma)
                ? ExtinctionCoefficient.FromPerKm(Positive("--extinction-per-km", sigma))
                : null,
            Transmittance = options.TryGetValue("--transmittance", out var t) ? Transmittance(t) : null,
            Baseline = options.TryGetValue("--baseline-m", out var b) ? new Metres(Positive("--baseline-m", b)) : null,
            LightIntensity = new Candela(NonNegative("--light-intensity-cd", options["--light-intensity-cd"])),
            BackgroundLuminance = hasLuminance
                ? new CandelaPerSquareMetre(NonNegative("--background-luminance", options["--background-luminance"]))
                : null,
            Period = hasPeriod ? ParsePeriod(options["--period"]) : null,
            ThresholdModel = continuous ? ThresholdModel.Continuous : ThresholdModel.AnnexBands,
        };
        if (continuous && inputs.BackgroundLuminance is { Value: 0 })
        {
            throw new ArgumentException("--background-luminance must be greater than 0 with --continuous-threshold");
        }
        if (luminanceUnknown)
        {
            inputs = inputs.WithUnknownLuminance();
        }

        var result = RvrCalculator.Calculate(inputs);

        var buffer = new ArrayBufferWriter<byte>();
        using (var json = new Utf8JsonWriter(buffer))
        {
            json.WriteStartObject();
            json.WriteNumber("mor_m", DownToTenth(result.Mor));
            json.WriteNumber("lights_m", DownToTenth(result.LightsRange));
            json.WriteNumber("object_m", DownToTenth(result.ObjectRange));
            json.WriteNumber("rvr_m", DownToTenth(result.Rvr));
            json.WriteString("report", result.Report.ToMetar());
            json.WriteBoolean("luminance_unknown", luminanceUnknown);
            json.WriteEndObject();
        }
        stdout.WriteLine(Encoding.UTF8.GetString(buffer.WrittenSpan));
        return 0;
    }

    private static Dictionary<string, string> Parse(IReadOnlyList<string> args, out bool continuous)
    {
        continuous = false;
        var options = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var i = 0; i < args.Count; i++)
        {
            var name = args[i];
            if (name == ContinuousFlag)
            {
                continuous = true;
                continue;
            }
            if (!_valueOptions.Contains(name, StringComparer.Ordinal))
            {
                throw new CliUsageException($"unknown option '{name}' for rvr");
            }
            if (i + 1 >= args.Count || args[i + 1].StartsWith("--", StringComparison.Ordinal))
            {
                throw new CliUsageException($"{name} needs a value");
            }
            if (!options.TryAdd(name, args[++i]))
            {
                throw new CliUsageException($"{name} given more than once");
            }
        }
        return options;
    }

    private static double Number(string option, string text)
    {
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !double.IsFinite(value))
        {
            throw new FormatException($"{option}: '{text}' is not a number");
        }
        return value;
    }

    private static double Positive(string option, string text)
    {
        var value = Number(option, text);
        return value > 0 ? value : throw new ArgumentException($"{option} must be greater than 0, got {text}");
    }

    private static double NonNegative(string option, string text)
    {
        var value = Number(option, text);
        return value >= 0 ? value : throw new ArgumentException($"{option} must be 0 or more, got {text}");
    }

    private static double Transmittance(string text)
    {
        var value = Number("--transmittance", text);
        return value is > 0 and < 1
            ? value
            : throw new ArgumentException($"--transmittance must be greater than 0 and less than 1, got {text}");
    }

    private static LuminanceBand ParsePeriod(string text) => text switch
    {
        "night" => LuminanceBand.Night,
        "intermediate" => LuminanceBand.Intermediate,
        "day" => LuminanceBand.Day,
        "bright" => LuminanceBand.BrightDay,
        _ => throw new ArgumentException($"--period must be night, intermediate, day or bright, got '{text}'"),
    };

    private static double DownToTenth(Metres metres) => Math.Floor(metres.Value * 10) / 10;
}
