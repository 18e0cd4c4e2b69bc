namespace OpsLvp.Core.Engine;

/// <summary>One thing the engine waits for, e.g. "recovery from active held 6 of 10 min".</summary>
/// <param name="HeldSeconds">For dwells, how long the condition has held (measured from where R7/R9 measure it).</param>
/// <param name="RequiredSeconds">For dwells, the dwell.</param>
/// <param name="Subjects">Sensor or item ids concerned (blocking sensors, open items).</param>
/// <param name="Kind">What is awaited.</param>
/// <param name="Text">Readable text for displays.</param>
public sealed record WaitingFor(WaitKind Kind, string Text, double? HeldSeconds, double? RequiredSeconds, IReadOnlyList<string> Subjects);
