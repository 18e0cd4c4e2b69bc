using System.Threading.Channels;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>Scripted demo actions from the simulator to the engine host (one reader), bounded; writers wait when full.</summary>
public sealed class DemoActionQueue
{
    /// <summary>Actions held before the simulator waits for the consumer.</summary>
    public const int Capacity = 1024;

    private readonly Channel<DemoAction> _channel = Channel.CreateBounded<DemoAction>(
        new BoundedChannelOptions(Capacity) { FullMode = BoundedChannelFullMode.Wait, SingleReader = true });

    public ValueTask SubmitAsync(DemoAction action, CancellationToken cancellationToken = default) =>
        _channel.Writer.WriteAsync(action, cancellationToken);

    public IAsyncEnumerable<DemoAction> ReadAllAsync(CancellationToken cancellationToken = default) =>
        _channel.Reader.ReadAllAsync(cancellationToken);

    public bool TryRead(out DemoAction? action) => _channel.Reader.TryRead(out action);
}
