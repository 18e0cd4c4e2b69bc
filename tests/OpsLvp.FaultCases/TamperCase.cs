namespace OpsLvp.FaultCases;

/// <summary>
/// One way of tampering with a stopped server's records and how it must show (docs/reliability.md "Tamper evidence").
/// </summary>
/// <param name="Name">Short id, used in test names and by the fault runner.</param>
/// <param name="What">What is done, in words.</param>
/// <param name="Apply">Does it to a recorded folder; throws when the tampering did not take (e.g. no row changed).</param>
/// <param name="Anomaly">The anomaly kind <c>opslvp audit verify --db --anchors --public-key</c> must list (exit 4); null for "nothing".</param>
/// <param name="StopText">Text the engine's stop reason must contain at the next start; null when the start does not check it.</param>
public sealed record TamperCase(string Name, string What, Func<ITamperTarget, Task> Apply, string? Anomaly, string? StopText)
{
    public override string ToString() => Name;
}
