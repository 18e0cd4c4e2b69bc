namespace OpsLvp.Web.Feeds;

/// <summary>
/// How a feed learns whether its batch was recorded: the engine host completes it once the batch's readings and the
/// evaluation they drove are durably committed, or refuses it with the reason (storage failing, not recording). Push
/// ingest answers 202 only on <see cref="BatchOutcome.Stored"/> (docs/reliability.md "Storage faults"); other feeds need not ask.
/// </summary>
public sealed class BatchReceipt
{
    private readonly TaskCompletionSource<BatchOutcome> _done = new(TaskCreationOptions.RunContinuationsAsynchronously);

    /// <summary>Completes once, when the batch is stored or refused.</summary>
    public Task<BatchOutcome> Outcome => _done.Task;

    /// <summary>The batch's readings are durably stored (first call wins).</summary>
    public void Confirm() => _done.TrySetResult(BatchOutcome.Recorded);

    /// <summary>The batch was not stored, for <paramref name="reason"/> (first call wins).</summary>
    public void Refuse(string reason) => _done.TrySetResult(new BatchOutcome(false, reason));
}
