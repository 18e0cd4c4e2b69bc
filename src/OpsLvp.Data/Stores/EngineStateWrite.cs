namespace OpsLvp.Data.Stores;

/// <summary>The engine state to store with an audit append, replacing the previous row.</summary>
/// <param name="StateJson">Serialised <see cref="OpsLvp.Core.Engine.EngineState"/> (must be JSON).</param>
/// <param name="ProfileVersion">Version of the aerodrome profile the state was evaluated with.</param>
/// <param name="SavedAt">When the state was saved.</param>
public sealed record EngineStateWrite(string StateJson, string ProfileVersion, DateTimeOffset SavedAt);
