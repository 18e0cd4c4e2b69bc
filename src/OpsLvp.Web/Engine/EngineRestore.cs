using OpsLvp.Core.Engine;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Engine;

/// <summary>
/// What <see cref="EngineStartup.RestoreAsync"/> found: either why the engine stays stopped (<see cref="Stopped"/>), or
/// the run, the state to continue from, the state already in the database (null when it must be written), the host's
/// audit entries for the first evaluation and how far the readings are covered by the chain.
/// </summary>
internal sealed record EngineRestore(
    string? Stopped,
    EngineRun? Run,
    EngineState? State,
    EngineState? Written,
    IReadOnlyList<NewAuditEntry> HostEntries,
    bool Acknowledged,
    long ReadingsCoveredTo);
