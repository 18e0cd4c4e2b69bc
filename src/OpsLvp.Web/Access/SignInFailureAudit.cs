using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Access;

/// <summary>
/// Failed sign-ins in the audit, bounded (docs/access.md): the first <see cref="DetailedPerMinute"/> of each minute get
/// their own entry (user name at most <see cref="SignInLimits.MaxUserNameLength"/> characters, reason, client address);
/// the rest of that minute become one <see cref="AccessAuditKinds.SignInFailedSummary"/> entry with their count and up to
/// <see cref="SummaryNames"/> distinct names, written when the minute is over (or at shutdown). Nothing is dropped
/// silently: every failure is in an entry or in a count.
/// </summary>
public sealed class SignInFailureAudit(AccessAudit audit, ILogger<SignInFailureAudit> logger) : IHostedService, IDisposable
{
    /// <summary>Failed sign-ins per minute written one by one before they are only counted.</summary>
    public const int DetailedPerMinute = 10;

    /// <summary>Distinct user names kept in a summary.</summary>
    public const int SummaryNames = 10;

    private readonly Lock _gate = new();
    private readonly SemaphoreSlim _writer = new(1, 1);
    private DateTimeOffset _minute;
    private int _detailed;
    private int _counted;
    private readonly HashSet<string> _names = new(StringComparer.Ordinal);
    private readonly HashSet<string> _addresses = new(StringComparer.Ordinal);
    private Timer? _timer;

    /// <summary>Records one failed sign-in (real time decides the minute; the entry carries the app clock's time).</summary>
    public async Task RecordAsync(string userName, string reason, string? address, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(userName);
        var name = userName.Length <= SignInLimits.MaxUserNameLength ? userName : userName[..SignInLimits.MaxUserNameLength];
        var minute = Minute(TimeProvider.System.GetUtcNow());
        (DateTimeOffset Minute, int Count, string[] Names, int Addresses)? due;
        bool detailed;
        lock (_gate)
        {
            due = TakeIfOver(minute);
            if (_minute != minute)
            {
                _minute = minute;
                _detailed = 0;
            }
            detailed = _detailed < DetailedPerMinute;
            if (detailed)
            {
                _detailed++;
            }
            else
            {
                _counted++;
                if (_names.Count < SummaryNames)
                {
                    _names.Add(name);
                }
                if (_addresses.Count < 1000)
                {
                    _addresses.Add(address ?? "unknown");
                }
            }
        }

        await WriteSummaryAsync(due, cancellationToken);
        if (detailed)
        {
            await WriteAsync(AccessAudit.Anonymous, AccessAuditKinds.SignInFailed, new { userName = name, reason, address }, cancellationToken);
        }
    }

    /// <summary>Writes the summary of a finished minute, if one is waiting.</summary>
    public Task FlushAsync(bool all, CancellationToken cancellationToken = default)
    {
        (DateTimeOffset Minute, int Count, string[] Names, int Addresses)? due;
        lock (_gate)
        {
            due = all ? Take() : TakeIfOver(Minute(TimeProvider.System.GetUtcNow()));
        }
        return WriteSummaryAsync(due, cancellationToken);
    }

    private (DateTimeOffset, int, string[], int)? TakeIfOver(DateTimeOffset minute) => _counted > 0 && _minute != minute ? Take() : null;

    private (DateTimeOffset, int, string[], int)? Take()
    {
        if (_counted == 0)
        {
            return null;
        }
        var taken = (_minute, _counted, _names.Order(StringComparer.Ordinal).ToArray(), _addresses.Count);
        _counted = 0;
        _names.Clear();
        _addresses.Clear();
        return taken;
    }

    private Task WriteSummaryAsync((DateTimeOffset Minute, int Count, string[] Names, int Addresses)? due, CancellationToken cancellationToken) =>
        due is { } s
            ? WriteAsync(AccessAudit.Anonymous, AccessAuditKinds.SignInFailedSummary,
                new { minuteStart = s.Minute, count = s.Count, userNames = s.Names, addresses = s.Addresses, note = $"failed sign-ins beyond the first {DetailedPerMinute} of the minute" },
                cancellationToken)
            : Task.CompletedTask;

    private async Task WriteAsync(string actor, string kind, object payload, CancellationToken cancellationToken)
    {
        await _writer.WaitAsync(cancellationToken);
        try
        {
            await audit.AppendAsync(actor, kind, payload, cancellationToken);
        }
        catch (AuditCommitException ex)
        {
            // Refused either way; the audit health shows the storage fault.
            logger.LogWarning(ex, "Failed sign-in could not be audited");
        }
        catch (ObjectDisposedException ex)
        {
            // The server is shutting down and its database services are gone; say what was not written.
            logger.LogWarning(ex, "Failed sign-in entry {Kind} not audited: the server is stopping", kind);
        }
        finally
        {
            _writer.Release();
        }
    }

    private static DateTimeOffset Minute(DateTimeOffset t) => new(t.Year, t.Month, t.Day, t.Hour, t.Minute, 0, TimeSpan.Zero);

    public Task StartAsync(CancellationToken cancellationToken)
    {
        _timer = new Timer(_ => _ = TickAsync(), null, TimeSpan.FromSeconds(5), TimeSpan.FromSeconds(5));
        return Task.CompletedTask;
    }

    private async Task TickAsync()
    {
        try
        {
            await FlushAsync(all: false);
        }
        catch (Exception ex) when (ex is ObjectDisposedException or OperationCanceledException)
        {
            // shutting down: StopAsync writes what is left
        }
    }

    public async Task StopAsync(CancellationToken cancellationToken)
    {
        if (_timer is not null)
        {
            await _timer.DisposeAsync();
        }
        await FlushAsync(all: true, cancellationToken);
    }

    // _writer is not disposed: a write still finishing at shutdown must be able to release it (a SemaphoreSlim
    // without a wait handle holds nothing to free).
    public void Dispose() => _timer?.Dispose();
}
