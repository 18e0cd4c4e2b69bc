namespace OpsLvp.Core.Profile;

/// <summary>A team that owns checklist items, e.g. airside operations.</summary>
public sealed record TeamConfig(string Id, string Name);
