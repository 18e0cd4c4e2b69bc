using OpsLvp.Core.Units;

namespace OpsLvp.Core.Optics;

/// <summary>One assessed (unrounded) RVR value at a time, as produced by a sensor's sampling cycle.</summary>
public readonly record struct RvrSample(DateTimeOffset Time, Metres Value);
