namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>A runway-light step the duty manager may set (docs/engine.md R20).</summary>
public sealed record ConsoleLightStep(int Step, string ButtonLabel);
