namespace OpsLvp.Core.Presentation;

/// <summary>One line of what a command acts against: "RWY 07 TDZ" — "500 m".</summary>
public sealed record PreviewFact(string Label, string Value);
