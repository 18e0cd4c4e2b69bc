namespace OpsLvp.Web.Cluster;

/// <summary>
/// The part of a contested <see cref="ILeadership"/> (several nodes on PostgreSQL) the engine host drives: one attempt
/// at start-up, the election loop while the host runs, and stepping down when an append was fenced off
/// (docs/engine.md R70–R72). <see cref="SingleNodeLeadership"/> has none of it.
/// </summary>
public interface ILeadershipElection
{
    /// <summary>One attempt to take leadership now (e.g. at start, so a lone node leads at once); false when another node holds it or the database cannot be reached.</summary>
    Task<bool> TryAcquireAsync(CancellationToken cancellationToken);

    /// <summary>Tries to take leadership every retry interval while standby, and checks it is still held while leading, until <paramref name="stoppingToken"/> is cancelled; then gives it up.</summary>
    Task RunAsync(CancellationToken stoppingToken);

    /// <summary>Gives leadership up at once (its database session is closed, so the lock is free for another node).</summary>
    void StepDown(string reason);
}
