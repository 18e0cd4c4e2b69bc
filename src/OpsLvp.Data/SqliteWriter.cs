using System.Globalization;
using Microsoft.Data.Sqlite;
using Microsoft.EntityFrameworkCore;

namespace OpsLvp.Data;

/// <summary>
/// One long-lived SQLite write connection for a store's hot path, with its commands prepared once and kept.
/// Opened through the context options (so the connection pragmas of <see cref="SqlitePragmaInterceptor"/> run once
/// on it) and checked for WAL and a synchronous level above OFF. Uses are serialised by a lock; after any failure
/// the connection is thrown away and the next use opens a fresh one. EF keeps the model, migrations and reads:
/// a fresh context, connection open and pragmas on every write cost about a millisecond each time in the server.
/// <para>Before each use the database's folder is checked to be writable (<see cref="EnsureFolderWritable"/>): a
/// connection kept open writes through its descriptors even after the folder turned read-only (e.g. a read-only
/// mount over it), so without the check the server would go on acknowledging into files it could not open again at its
/// next start, and whether a push was stored would depend on which connection took it (docs/reliability.md
/// "Read-only data folder").</para>
/// </summary>
internal sealed class SqliteWriter(IDbContextFactory<OpsLvpDbContext> factory, string purpose) : IDisposable
{
    private readonly SemaphoreSlim _lock = new(1, 1);
    private Session? _session;
    private bool _disposed;
    private string? _probePath;
    private bool _probeKnown;

    /// <summary>The file <see cref="EnsureFolderWritable"/> opens for writing: beside the database file.</summary>
    public const string ProbeSuffix = "-writable";

    /// <summary>Runs <paramref name="work"/> on the open connection, alone.</summary>
    /// <exception cref="InvalidOperationException">The connection is not SQLite, or not in WAL mode, or synchronous is OFF.</exception>
    public async Task<T> RunAsync<T>(Func<Session, T> work, CancellationToken cancellationToken)
    {
        await _lock.WaitAsync(cancellationToken);
        try
        {
            ObjectDisposedException.ThrowIf(_disposed, this);
            cancellationToken.ThrowIfCancellationRequested();
            // before the session: a connection opened while the folder is read-only would stay read-only
            EnsureFolderWritable();
            var session = _session ??= await Session.OpenAsync(factory, purpose, cancellationToken);
            try
            {
                return work(session);
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

    /// <summary>
    /// Opens <c>&lt;database&gt;-writable</c> for writing (created empty the first time, never written) and closes it: a
    /// new open, so it fails as soon as the folder cannot be written, while the kept connection's descriptors still could.
    /// Nothing for an in-memory database. Costs one open and close (microseconds) next to a commit's fsync.
    /// </summary>
    /// <exception cref="IOException">The folder cannot be written; the message names it and the system's reason.</exception>
    private void EnsureFolderWritable()
    {
        if (!_probeKnown)
        {
            using var context = factory.CreateDbContext();
            var builder = new SqliteConnectionStringBuilder(context.Database.GetConnectionString());
            _probePath = builder.Mode == SqliteOpenMode.Memory || string.IsNullOrEmpty(builder.DataSource) || builder.DataSource.StartsWith(':')
                ? null
                : Path.GetFullPath(builder.DataSource) + ProbeSuffix;
            _probeKnown = true;
        }
        if (_probePath is null)
        {
            return;
        }
        try
        {
            using var probe = File.OpenHandle(_probePath, FileMode.OpenOrCreate, FileAccess.Write, FileShare.ReadWrite);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            // no inner exception: the host names a failure by its innermost message, and this one must say what failed
            throw new IOException($"the data folder {Path.GetDirectoryName(_probePath)} cannot be written ({purpose}): {ex.GetType().Name}: {ex.Message}");
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

    /// <summary>The open connection (owned by a context so the configured interceptors ran on it) and its commands.</summary>
    internal sealed class Session : IDisposable
    {
        private readonly OpsLvpDbContext _context;
        private readonly Dictionary<string, SqliteCommand> _commands = new(StringComparer.Ordinal);

        private Session(OpsLvpDbContext context, SqliteConnection connection)
        {
            _context = context;
            Connection = connection;
        }

        public SqliteConnection Connection { get; }

        /// <summary>The command for <paramref name="sql"/> (made once, with one parameter per name), enlisted in <paramref name="transaction"/>.</summary>
        public SqliteCommand Command(string sql, SqliteTransaction transaction, params string[] parameterNames)
        {
            if (!_commands.TryGetValue(sql, out var command))
            {
                command = Connection.CreateCommand();
                command.CommandText = sql;
                foreach (var name in parameterNames)
                {
                    command.Parameters.Add(new SqliteParameter { ParameterName = name });
                }
                _commands.Add(sql, command);
            }
            command.Transaction = transaction;
            return command;
        }

        /// <summary>Sets each parameter in order; null becomes SQL NULL.</summary>
        public static void Bind(SqliteCommand command, params object?[] values)
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
                if (context.Database.GetDbConnection() is not SqliteConnection connection)
                {
                    throw new InvalidOperationException($"the {purpose} needs a SQLite connection.");
                }
                using (var check = connection.CreateCommand())
                {
                    check.CommandText = "PRAGMA journal_mode;";
                    var journalMode = Convert.ToString(check.ExecuteScalar(), CultureInfo.InvariantCulture);
                    if (!string.Equals(journalMode, "wal", StringComparison.OrdinalIgnoreCase))
                    {
                        throw new InvalidOperationException($"SQLite PRAGMA journal_mode is '{journalMode}' on the {purpose} connection, expected 'wal'.");
                    }
                    check.CommandText = "PRAGMA synchronous;";
                    var synchronous = Convert.ToInt64(check.ExecuteScalar(), CultureInfo.InvariantCulture);
                    if (synchronous == 0)
                    {
                        throw new InvalidOperationException($"SQLite PRAGMA synchronous is OFF on the {purpose} connection.");
                    }
                }
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
