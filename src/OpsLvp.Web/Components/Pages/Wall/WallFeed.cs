namespace OpsLvp.Web.Components.Pages.Wall;

/// <summary>A feed's health: name, status word with a glyph, and a detail line.</summary>
public sealed record WallFeed(string Name, string Glyph, string StatusText, string Detail, string CssClass);
