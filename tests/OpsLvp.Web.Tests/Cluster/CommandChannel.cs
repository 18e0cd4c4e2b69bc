using OpsLvp.Web.Cluster;
using StackExchange.Redis;

namespace OpsLvp.Web.Tests.Cluster;

/// <summary>
/// Waiting until the nodes listen for forwarded commands. A node connects to Redis and subscribes in the background
/// after its start returns (RedisLink, CommandForwarding): a command sent before that is refused at once by the sender
/// ("not connected yet") or never reaches the leader. A fast machine gets to the first command before either is done.
/// </summary>
public static class CommandChannel
{
    /// <summary>Waits (up to 60 s) until at least <paramref name="subscribers"/> connections listen on the command channel.</summary>
    public static async Task WaitForSubscribersAsync(string redis, int subscribers)
    {
        await using var observer = await ConnectionMultiplexer.ConnectAsync(redis);
        var channel = "opslvp:" + CommandForwarding.CommandsChannel;
        var deadline = DateTime.UtcNow.AddSeconds(60);
        long count = 0;
        while (true)
        {
            var answer = (RedisResult[])(await observer.GetDatabase().ExecuteAsync("PUBSUB", "NUMSUB", channel))!;
            count = (long)answer[1];
            if (count >= subscribers)
            {
                return;
            }
            if (DateTime.UtcNow > deadline)
            {
                throw new Xunit.Sdk.XunitException($"only {count} of {subscribers} connections listen on {channel} after 60 s");
            }
            await Task.Delay(50);
        }
    }
}
