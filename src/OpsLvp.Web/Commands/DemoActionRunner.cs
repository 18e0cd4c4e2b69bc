using OpsLvp.Core.Engine.Replay;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds.Demo;

namespace OpsLvp.Web.Commands;

/// <summary>
/// Executes the simulator's scripted demo actions (ticks by invented demo people) through the command service,
/// as a demo caller with the duty manager and ground staff roles and every team, so the unattended demo night
/// completes its cancellation. Each action is parsed by <see cref="ActionsCsv"/> (the replay format).
/// </summary>
public sealed class DemoActionRunner(DemoActionQueue queue, ILvpCommandService commands, LiveEngineHost host, ILogger<DemoActionRunner> logger) : BackgroundService
{
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        await Task.Yield();
        try
        {
            await foreach (var action in queue.ReadAllAsync(stoppingToken))
            {
                try
                {
                    await RunAsync(action, stoppingToken);
                }
                catch (FormatException ex)
                {
                    logger.LogWarning("Demo action skipped: {Error}", ex.Message);
                }
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
        }
    }

    private async Task RunAsync(DemoAction action, CancellationToken stoppingToken)
    {
        var line = string.Join(',', new[] { action.Time.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", System.Globalization.CultureInfo.InvariantCulture), action.Actor, action.Action, action.Target, action.Value ?? "", action.Reason }.Select(Quote));
        var command = ActionsCsv.Parse(ActionsCsv.Header + "\n" + line + "\n", "demo action").Single().Command;
        var teams = host.Profile?.Teams.Select(t => t.Id).ToHashSet(StringComparer.Ordinal) ?? [];
        var caller = new CommandCaller(action.Actor, new HashSet<string>(StringComparer.Ordinal) { Roles.DutyManager, Roles.GroundStaff }, teams, true);
        var outcome = await commands.ExecuteAsync(caller, command, stoppingToken);
        if (!outcome.Applied)
        {
            logger.LogInformation("Demo action {Action} {Target} by {Actor}: {Kind} ({Message})", action.Action, action.Target, action.Actor, outcome.Kind, outcome.Message);
        }
    }

    private static string Quote(string field) => "\"" + field.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";
}
