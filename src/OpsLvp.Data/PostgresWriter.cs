using Microsoft.EntityFrameworkCore;
using Npgsql;
using NpgsqlTypes;

namespace OpsLvp.Data;

/// <summary>
/// The PostgreSQL counterpart of <see cref="SqliteWriter"/>: one long-lived connection for a store's hot path, its
/// statements prepared on the server once and kept. Opened through the context options and checked for
/// <c>synchronous_commit</c> other than <c>off</c> (a commit that returned is on disk). Uses are serialised by a lock
/// within the process; across nodes the statements themselves take the database's locks. After any failure the
/// connection is thrown away and the next use opens a fresh one.
/// </summary>
internal sealed class PostgresWriter(IDbContextFactory<OpsLvpDbContext> factory, string purpose) : IDisposable
{
    private readonly SemaphoreSlim _lock = new(1, 1);
    private Session? _session;
    private bool _disposed;

    /// <summary>Runs <paramref name="work"/> on the open connection, alone.</summary>
    /// <exception cref="InvalidOperationException">The connection is not PostgreSQL, or synchronous_commit is off.</exception>
    public async Task<T> RunAsync<T>(Func<Session, CancellationToken, Task<T>> work, CancellationToken cancellationToken)
    {
        await _lock.WaitAsync(cancellationToken);
        try
        {
            ObjectDisposedException.ThrowIf(_disposed, this);
            cancellationToken.ThrowIfCancellationRequested();
            var session = _session ??= await Session.OpenAsync(factory, purpose, cancellationToken);
            try
            {
                return await work(session, cancellationToken);
            }
            catch
            {
                // Whatever state the connection is in after a failure, the next use starts on a fresh one.
                _session = null;
                session.Dispose();
                throw;
            }
        }
        finally
        {
            _lock.Release();
        }
    }

    public void Dispose()
    {
        if (_disposed)
        {
            return;
        }
        _lock.Wait();
        try
        {
            _disposed = true;
            _session?.Dispose();
            _session = null;
        }
        finally
        {
            _lock.Release();
        }
        _lock.Dispose();
    }

    /// <summary>The open connection (owned by a context) and its prepared commands.</summary>
    internal sealed class Session : IDisposable
    {
        private readonly OpsLvpDbContext _context;
        private readonly Dictionary<string, NpgsqlCommand> _commands = new(StringComparer.Ordinal);

        private Session(OpsLvpDbContext context, NpgsqlConnection connection)
        {
            _context = context;
            Connection = connection;
        }

        public NpgsqlConnection Connection { get; }

        /// <summary>
        /// The command for <paramref name="sql"/> with positional parameters (<c>$1</c>, <c>$2</c>, ...) of the given
        /// types, prepared on the server the first time, enlisted in <paramref name="transaction"/>.
        /// </summary>
        public async Task<NpgsqlCommand> CommandAsync(string sql, NpgsqlTransaction transaction, CancellationToken cancellationToken, params NpgsqlDbType[] types)
        {
            if (!_commands.TryGetValue(sql, out var command))
            {
                command = new NpgsqlCommand(sql, Connection, transaction);
                foreach (var type in types)
                {
                    command.Parameters.Add(new NpgsqlParameter { NpgsqlDbType = type });
                }
                await command.PrepareAsync(cancellationToken);
                _commands.Add(sql, command);
            }
            command.Transaction = transaction;
            return command;
        }

        /// <summary>Sets each parameter in order; null becomes SQL NULL.</summary>
        public static void Bind(NpgsqlCommand command, params object?[] values)
        {
            for (var i = 0; i < values.Length; i++)
            {
                command.Parameters[i].Value = values[i] ?? DBNull.Value;
            }
        }

        public static async Task<Session> OpenAsync(IDbContextFactory<OpsLvpDbContext> factory, string purpose, CancellationToken cancellationToken)
        {
            var context = await factory.CreateDbContextAsync(cancellationToken);
            try
            {
                await context.Database.OpenConnectionAsync(cancellationToken);
                if (context.Database.GetDbConnection() is not NpgsqlConnection connection)
                {
                    throw new InvalidOperationException($"the {purpose} needs a PostgreSQL connection.");
                }
                await DatabaseChecks.EnsureDurableAsync(connection, cancellationToken);
                return new Session(context, connection);
            }
            catch
            {
                await context.DisposeAsync();
                throw;
            }
        }

        public void Dispose()
        {
            foreach (var command in _commands.Values)
            {
                command.Dispose();
            }
            _commands.Clear();
            _context.Dispose();
        }
    }
}
