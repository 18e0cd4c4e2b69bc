namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>A key figure (governing RVR, ceiling): label, value with unit, where it comes from, and a state class.</summary>
public sealed record WallFigure(string Label, string ValueText, string Detail, string CssClass);
