using System.Threading.Channels;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// The one queue between all feeds and the engine host: a bounded channel of <see cref="ReadingBatch"/>
/// (capacity <c>Feeds:PipelineCapacity</c>). Many writers, one reader. When full, <see cref="SubmitAsync"/>
/// waits for room and <see cref="TrySubmit"/> returns false.
/// </summary>
public sealed class ReadingPipeline
{
    private readonly Channel<ReadingBatch> _channel;

    public ReadingPipeline(IOptions<FeedsOptions> options)
    {
        Capacity = options.Value.PipelineCapacity;
        _channel = Channel.CreateBounded<ReadingBatch>(new BoundedChannelOptions(Capacity)
        {
            FullMode = BoundedChannelFullMode.Wait,
            SingleReader = true,
            SingleWriter = false,
        });
    }

    public int Capacity { get; }

    /// <summary>Batches waiting for the consumer.</summary>
    public int Count => _channel.Reader.Count;

    /// <summary>Queues a batch, waiting while the pipeline is full.</summary>
    public ValueTask SubmitAsync(ReadingBatch batch, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(batch);
        return _channel.Writer.WriteAsync(batch, cancellationToken);
    }

    /// <summary>Queues a batch if there is room now; false when the pipeline is full.</summary>
    public bool TrySubmit(ReadingBatch batch)
    {
        ArgumentNullException.ThrowIfNull(batch);
        return _channel.Writer.TryWrite(batch);
    }

    /// <summary>The consumer side: every batch in arrival order, until cancelled. Meant for one reader (the engine host).</summary>
    public IAsyncEnumerable<ReadingBatch> ReadAllAsync(CancellationToken cancellationToken = default) =>
        _channel.Reader.ReadAllAsync(cancellationToken);

    /// <summary>Takes a waiting batch without blocking; false when none is queued.</summary>
    public bool TryRead(out ReadingBatch? batch) => _channel.Reader.TryRead(out batch);
}
