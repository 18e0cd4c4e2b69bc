using OpsLvp.Core.Readings;

namespace OpsLvp.Web.Feeds;

/// <summary>The wire names of kinds and statuses in OpsLvp's own feed formats (docs/feeds.md), lower snake case.</summary>
public static class ReadingWireNames
{
    private static readonly Dictionary<string, ReadingKind> s_kinds = new(StringComparer.Ordinal)
    {
        ["rvr"] = ReadingKind.Rvr,
        ["visibility"] = ReadingKind.Visibility,
        ["cloud_base"] = ReadingKind.CloudBase,
        ["vertical_visibility"] = ReadingKind.VerticalVisibility,
        ["extinction"] = ReadingKind.Extinction,
        ["transmittance"] = ReadingKind.Transmittance,
        ["background_luminance"] = ReadingKind.BackgroundLuminance,
        ["light_step"] = ReadingKind.LightStep,
    };

    private static readonly Dictionary<string, ReadingStatus> s_statuses = new(StringComparer.Ordinal)
    {
        ["ok"] = ReadingStatus.Ok,
        ["degraded"] = ReadingStatus.Degraded,
        ["failed"] = ReadingStatus.Failed,
        ["maintenance"] = ReadingStatus.Maintenance,
    };

    public static IReadOnlyCollection<string> Kinds => s_kinds.Keys;

    public static IReadOnlyCollection<string> Statuses => s_statuses.Keys;

    /// <summary>Exact, case-sensitive match of a wire kind name.</summary>
    public static bool TryParseKind(string text, out ReadingKind kind) => s_kinds.TryGetValue(text, out kind);

    /// <summary>Exact, case-sensitive match of a wire status name.</summary>
    public static bool TryParseStatus(string text, out ReadingStatus status) => s_statuses.TryGetValue(text, out status);

    public static string ToWire(ReadingKind kind) => s_kinds.First(p => p.Value == kind).Key;

    public static string ToWire(ReadingStatus status) => s_statuses.First(p => p.Value == status).Key;

    public static string ToWire(RejectReason reason) => reason switch
    {
        RejectReason.Malformed => "malformed",
        RejectReason.StatusNotOk => "status_not_ok",
        RejectReason.OutOfRange => "out_of_range",
        RejectReason.FutureDated => "future_dated",
        RejectReason.Duplicate => "duplicate",
        RejectReason.OlderThanLatest => "older_than_latest",
        RejectReason.UnknownSensor => "unknown_sensor",
        RejectReason.KindNotProduced => "kind_not_produced",
        _ => reason.ToString().ToLowerInvariant(),
    };
}
