using Microsoft.EntityFrameworkCore;
using Microsoft.Extensions.Options;
using Npgsql;
using OpsLvp.Data;
using OpsLvp.Data.Entities;
using OpsLvp.Web.Time;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// Leadership of several nodes on one PostgreSQL database (docs/deployment.md "PostgreSQL and several nodes";
/// docs/engine.md R70–R72). Each node keeps one dedicated connection (TCP keep-alives on, no pool) and tries
/// <c>pg_try_advisory_lock</c> on it every <see cref="ClusterOptions.LeaderRetryInterval"/>. The holder leads: on
/// winning it takes, in ONE transaction, the same <c>audit_entries</c> lock the appends take and increments the
/// epoch in <c>engine_leadership</c>; that epoch is the fencing token its appends carry. PostgreSQL frees the lock
/// when the session ends (a killed process closes its socket; a cut network is bounded by the keep-alives), so a
/// standby takes over. A leader checks each interval that its session is alive and the epoch on record is still its
/// own, and steps down otherwise: from then on it does not evaluate (its appends would be refused anyway), and it
/// waits three intervals before competing again, so a healthy standby takes over first.
/// </summary>
public sealed class PostgresLeadership : ILeadership, ILeadershipElection, IDisposable
{
    /// <summary>The advisory lock key of the OpsLvp engine ("OpsLvp" in ASCII).</summary>
    public const long LockKey = 0x4F70_734C_7670;

    /// <summary>The <c>application_name</c> prefix of the leadership connection (followed by the node id), as <c>pg_stat_activity</c> shows it.</summary>
    public const string ApplicationNamePrefix = "opslvp-leadership:";

    private const string TakeSql =
        "LOCK TABLE audit_entries IN SHARE ROW EXCLUSIVE MODE; "
        + "INSERT INTO engine_leadership (id, epoch, node_id, since) VALUES (1, 1, @node, @since) "
        + "ON CONFLICT (id) DO UPDATE SET epoch = engine_leadership.epoch + 1, node_id = excluded.node_id, since = excluded.since "
        + "RETURNING epoch";

    private readonly IDbContextFactory<OpsLvpDbContext> _factory;
    private readonly TimeProvider _realClock;
    private readonly ILogger<PostgresLeadership> _logger;
    private readonly TimeSpan _interval;
    private readonly SemaphoreSlim _lock = new(1, 1);
    private NpgsqlConnection? _connection;
    private volatile bool _isLeader;
    private long _epoch;
    private volatile string? _stepDownRequested;
    private DateTimeOffset _holdOffUntil;
    private bool _disposed;

    public PostgresLeadership(
        IDbContextFactory<OpsLvpDbContext> factory,
        IOptions<ClusterOptions> options,
        [FromKeyedServices(TimeServiceCollectionExtensions.NetworkClockKey)] TimeProvider realClock,
        ILogger<PostgresLeadership> logger)
    {
        _factory = factory;
        _realClock = realClock;
        _logger = logger;
        NodeId = options.Value.ResolvedNodeId;
        _interval = options.Value.LeaderRetryInterval;
    }

    public string NodeId { get; }

    public bool IsLeader => _isLeader;

    public long Epoch => _isLeader ? Interlocked.Read(ref _epoch) : 0;

    public event Action<bool>? LeadershipChanged;

    public async Task<bool> TryAcquireAsync(CancellationToken cancellationToken)
    {
        await _lock.WaitAsync(cancellationToken);
        try
        {
            if (!_isLeader)
            {
                await AttemptAsync(cancellationToken);
            }
            return _isLeader;
        }
        finally
        {
            _lock.Release();
        }
    }

    public async Task RunAsync(CancellationToken stoppingToken)
    {
        try
        {
            while (!stoppingToken.IsCancellationRequested)
            {
                await _lock.WaitAsync(stoppingToken);
                try
                {
                    if (_stepDownRequested is { } reason)
                    {
                        _stepDownRequested = null;
                        Lose(reason);
                    }
                    if (_isLeader)
                    {
                        await CheckHeldAsync(stoppingToken);
                    }
                    else if (_realClock.GetUtcNow() >= _holdOffUntil)
                    {
                        await AttemptAsync(stoppingToken);
                    }
                }
                finally
                {
                    _lock.Release();
                }
                await Task.Delay(_interval, _realClock, stoppingToken);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
        finally
        {
            // a node that stops gives leadership up at once, so a standby need not wait for the session to time out
            await _lock.WaitAsync(CancellationToken.None);
            try
            {
                Lose(_isLeader ? "the node is stopping" : null);
            }
            finally
            {
                _lock.Release();
            }
        }
    }

    public void StepDown(string reason)
    {
        if (!_isLeader)
        {
            return;
        }
        if (_lock.Wait(0))
        {
            try
            {
                Lose(reason);
            }
            finally
            {
                _lock.Release();
            }
        }
        else
        {
            // the loop holds the connection now: it closes it on its next turn; evaluation stops at once
            _stepDownRequested = reason;
            SetLeader(false, reason);
        }
    }

    public void Dispose()
    {
        if (_disposed)
        {
            return;
        }
        _disposed = true;
        _connection?.Dispose();
        _connection = null;
    }

    /// <summary>Opens the session if needed and tries the lock; on winning, increments the epoch under the audit lock.</summary>
    private async Task AttemptAsync(CancellationToken cancellationToken)
    {
        try
        {
            var connection = _connection ??= await OpenAsync(cancellationToken);
            await using (var attempt = new NpgsqlCommand("SELECT pg_try_advisory_lock(@key)", connection))
            {
                attempt.Parameters.AddWithValue("key", LockKey);
                if (await attempt.ExecuteScalarAsync(cancellationToken) is not true)
                {
                    return;
                }
            }
            long epoch;
            await using (var transaction = await connection.BeginTransactionAsync(cancellationToken))
            {
                await using var take = new NpgsqlCommand(TakeSql, connection, transaction);
                take.Parameters.AddWithValue("node", NodeId);
                take.Parameters.AddWithValue("since", UtcTextConverter.Format(_realClock.GetUtcNow()));
                epoch = Convert.ToInt64(await take.ExecuteScalarAsync(cancellationToken), System.Globalization.CultureInfo.InvariantCulture);
                await transaction.CommitAsync(cancellationToken);
            }
            Interlocked.Exchange(ref _epoch, epoch);
            _logger.LogWarning("Node {Node} took leadership with epoch {Epoch}: it runs the engine", NodeId, epoch);
            SetLeader(true, null);
        }
        catch (Exception ex) when (ex is NpgsqlException or InvalidOperationException or TimeoutException)
        {
            // not reachable, or the epoch not taken: close the session (it frees the lock if it was won) and try again later
            _logger.LogDebug(ex, "Node {Node}: leadership attempt failed: {Error}", NodeId, ex.Message);
            CloseConnection();
        }
    }

    /// <summary>While leading: the session answers and the epoch on record is still this node's; otherwise step down.</summary>
    private async Task CheckHeldAsync(CancellationToken cancellationToken)
    {
        if (_connection is null)
        {
            Lose("the leadership session is closed");
            return;
        }
        try
        {
            await using var check = new NpgsqlCommand($"SELECT epoch FROM engine_leadership WHERE id = {EngineLeadershipRow.SingleId}", _connection);
            check.CommandTimeout = Math.Max(1, (int)Math.Ceiling(_interval.TotalSeconds * 3));
            var current = await check.ExecuteScalarAsync(cancellationToken) as long?;
            if (current != Interlocked.Read(ref _epoch))
            {
                Lose($"the epoch on record is {current?.ToString(System.Globalization.CultureInfo.InvariantCulture) ?? "missing"}, not this node's {Interlocked.Read(ref _epoch)}");
            }
        }
        catch (Exception ex) when (ex is NpgsqlException or InvalidOperationException or TimeoutException)
        {
            Lose($"the leadership session was lost: {ex.Message.ReplaceLineEndings(" ")}");
        }
    }

    // a dedicated session: the advisory lock lives and dies with it
    private Task<NpgsqlConnection> OpenAsync(CancellationToken cancellationToken) =>
        DedicatedSession.OpenAsync(_factory, b =>
        {
            b.KeepAlive = Math.Max(1, (int)_interval.TotalSeconds);
            b.TcpKeepAlive = true;
            b.TcpKeepAliveTime = 2;
            b.TcpKeepAliveInterval = 1;
            b.ApplicationName = ApplicationNamePrefix + NodeId;
        }, cancellationToken);

    /// <summary>Closes the session (freeing the lock) and, if leading, steps down with <paramref name="reason"/>.</summary>
    private void Lose(string? reason)
    {
        CloseConnection();
        if (_isLeader && reason is not null)
        {
            SetLeader(false, reason);
        }
    }

    private void CloseConnection()
    {
        try
        {
            _connection?.Dispose();
        }
        catch (Exception ex) when (ex is NpgsqlException or IOException or InvalidOperationException)
        {
            _logger.LogDebug(ex, "Closing the leadership session failed");
        }
        _connection = null;
    }

    private void SetLeader(bool leader, string? reason)
    {
        if (_isLeader == leader)
        {
            return;
        }
        _isLeader = leader;
        if (!leader)
        {
            // a node that lost leadership lets a healthy standby take over before it competes again
            _holdOffUntil = _realClock.GetUtcNow() + (_interval * 3);
            _logger.LogError("Node {Node} stepped down from leadership (epoch {Epoch}): {Reason}; it no longer evaluates or appends", NodeId, Interlocked.Read(ref _epoch), reason);
        }
        try
        {
            LeadershipChanged?.Invoke(leader);
        }
        catch (Exception ex)
        {
            _logger.LogError(ex, "A leadership change handler failed");
        }
    }
}
