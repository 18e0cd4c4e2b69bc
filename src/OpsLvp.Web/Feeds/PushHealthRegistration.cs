using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Feeds;

/// <summary>Lists each configured push key in the health registry at start, so a silent push client shows up.</summary>
public sealed class PushHealthRegistration(IOptions<FeedsOptions> options, FeedHealthRegistry health) : IHostedService
{
    public Task StartAsync(CancellationToken cancellationToken)
    {
        foreach (var key in options.Value.Push.ApiKeys)
        {
            health.Register("push:" + key.Name, "push");
        }

        return Task.CompletedTask;
    }

    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;
}
