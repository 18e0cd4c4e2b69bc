using OpsLvp.Core.Engine;
using OpsLvp.Core.Optics;

namespace OpsLvp.Web.Engine;

/// <summary>
/// What one run of the engine works with, from a start (or a takeover) to its stop: the engine for the validated
/// profile, the RVR derivation (1-minute means of raw sensors) and the 10-minute tendencies.
/// </summary>
internal sealed record EngineRun(LvpEngine Engine, RvrDerivation Derivation, RvrTrends Trends);
