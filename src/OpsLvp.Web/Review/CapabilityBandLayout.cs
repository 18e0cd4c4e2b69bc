using System.Globalization;
using OpsLvp.Core.Review;

namespace OpsLvp.Web.Review;

/// <summary>
/// Where and how a capability band's segments are drawn on the review page (docs/capability.md "Review"): position and
/// width as a share of the window, the label in words (never colour alone) and the hover / screen-reader text.
/// </summary>
public static class CapabilityBandLayout
{
    /// <summary>Left edge and width in percent of <paramref name="from"/>–<paramref name="to"/>, invariant-culture text for CSS.</summary>
    public static (string Left, string Width) Place(CapabilitySegment segment, DateTimeOffset from, DateTimeOffset to)
    {
        ArgumentNullException.ThrowIfNull(segment);
        var total = (to - from).TotalSeconds;
        if (total <= 0)
        {
            return ("0", "100");
        }
        var left = Math.Clamp((segment.Start - from).TotalSeconds / total * 100, 0, 100);
        var width = Math.Clamp((segment.End - segment.Start).TotalSeconds / total * 100, 0, 100 - left);
        return (left.ToString("0.###", CultureInfo.InvariantCulture), width.ToString("0.###", CultureInfo.InvariantCulture));
    }

    /// <summary>What the segment shows: "CAT II · LVTO available", or the best category alone when the direction offers no LVTO.</summary>
    public static string Label(CapabilityState state)
    {
        ArgumentNullException.ThrowIfNull(state);
        return state.Lvto.Length > 0 ? $"{state.Best} · {state.Lvto}" : state.Best;
    }

    /// <summary>
    /// The hover and accessible text: "07L 22:30:00Z–23:25:00Z: CAT II, LVTO available. Not available: CAT III: TDZ
    /// lights 07L unserviceable (…)" (the first reason only; the table below the chart lists every one).
    /// </summary>
    public static string Describe(CapabilitySegment segment)
    {
        ArgumentNullException.ThrowIfNull(segment);
        var s = segment.State;
        var text = $"{s.Direction}{(s.InUse ? " (in use)" : "")} {ReviewFormat.Clock(segment.Start)}–{ReviewFormat.Clock(segment.End)}: {s.Best}{(s.Lvto.Length > 0 ? ", " + s.Lvto : "")}";
        return s.FirstReason.Length > 0 ? $"{text}. Not available: {s.FirstReason}" : text;
    }

    /// <summary>A CSS class per best category (a second cue beside the words).</summary>
    public static string Tone(CapabilityState state)
    {
        ArgumentNullException.ThrowIfNull(state);
        return state.Best switch
        {
            "CAT III" => "cap-band-cat3",
            "CAT II" => "cap-band-cat2",
            "CAT I" => "cap-band-cat1",
            _ => "cap-band-none",
        };
    }
}
