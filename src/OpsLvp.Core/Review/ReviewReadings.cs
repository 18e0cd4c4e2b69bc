using OpsLvp.Core.Optics;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Review;

/// <summary>
/// The readings a review shows: the raw readings as received plus the RVR derived from raw extinction and
/// transmittance by <see cref="RvrDerivation"/> (the same derivation the live host and the replay use), so lowest
/// RVR and the timeline include the computing sensors. Exports and replays keep only the raw readings.
/// </summary>
public static class ReviewReadings
{
    public static IReadOnlyList<Reading> WithDerivedRvr(AerodromeProfile profile, IReadOnlyList<Reading> raw)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(raw);
        var derivation = new RvrDerivation(profile);
        var all = new List<Reading>(raw.Count);
        foreach (var r in raw)
        {
            all.Add(r);
            all.AddRange(derivation.Observe(r));
        }
        return all;
    }
}
