using OpsLvp.Core.Reporting;
using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>
/// The result of one RVR assessment: MOR, the lights range (Allard), the object range (Koschmieder, = MOR), the RVR
/// (the greater of the two ranges, Doc 9328), all unrounded in metres, and the RVR's reported value.
/// </summary>
public sealed record RvrAssessment(
    Metres Mor,
    Metres LightsRange,
    Metres ObjectRange,
    Metres Rvr,
    Lux Threshold,
    RvrReport Report);
