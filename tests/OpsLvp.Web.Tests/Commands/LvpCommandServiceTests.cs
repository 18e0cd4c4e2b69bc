using Microsoft.Data.Sqlite;
using Microsoft.Extensions.DependencyInjection;
using OpsLvp.Core.Engine;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Tests.Infrastructure;
using OpsLvp.Web.Tests.Live;

namespace OpsLvp.Web.Tests.Commands;

/// <summary>The command service on the running app: roles, input, audit first. People and reasons invented.</summary>
public sealed class LvpCommandServiceTests
{
    private static CommandCaller Caller(string name, string role, params string[] teams) =>
        new(name, new HashSet<string> { role }, teams.ToHashSet(), true);

    private static readonly CommandCaller Manager = Caller("dm.test", Roles.DutyManager);

    [Fact]
    public async Task WithoutTheRole_OrSignedOut_CommandsAreRefused_AndNothingIsAudited()
    {
        await using var run = await Run.StartAsync();
        // Issuing the hub-read key that reads the state is itself audited: issue it before counting.
        await LiveClient.ReaderKeyAsync(run.App);
        var before = (await LiveClient.EntriesAsync(run.App)).Count;
        var declare = new DeclarePhase("x", Phase.Active, "fog (test)");
        var viewer = await run.Commands.ExecuteAsync(Caller("v.test", Roles.Viewer), declare);
        var ground = await run.Commands.ExecuteAsync(Caller("g.test", Roles.GroundStaff, LiveTestProfile.Team), declare);
        var admin = await run.Commands.ExecuteAsync(Caller("a.test", Roles.Administrator), declare);
        var anonymous = await run.Commands.ExecuteAsync(CommandCaller.Anonymous, declare);
        Assert.All(new[] { viewer, ground, admin, anonymous }, o => Assert.Equal(CommandOutcomeKind.Refused, o.Kind));
        Assert.Contains("role", viewer.Message, StringComparison.Ordinal);
        Assert.Contains("sign in", anonymous.Message, StringComparison.Ordinal);
        Assert.Equal("normal", LiveClient.Phase(await LiveClient.StateAsync(run.App)));
        Assert.Equal(before, (await LiveClient.EntriesAsync(run.App)).Count);
    }

    [Fact]
    public async Task WithoutAReason_OrWithAnUnknownSensor_CommandsAreRefused()
    {
        await using var run = await Run.StartAsync();
        var blank = await run.Commands.ExecuteAsync(Manager, new DeclarePhase("x", Phase.Active, "  "));
        Assert.Equal(CommandOutcomeKind.Refused, blank.Kind);
        Assert.Contains("reason", blank.Message, StringComparison.Ordinal);
        var sensor = await run.Commands.ExecuteAsync(Manager, new SetSensorService("x", "t-none", false, "maintenance (test)"));
        Assert.Equal(CommandOutcomeKind.Refused, sensor.Kind);
        Assert.Contains("t-none", sensor.Message, StringComparison.Ordinal);
        Assert.Equal("normal", LiveClient.Phase(await LiveClient.StateAsync(run.App)));
    }

    [Fact]
    public async Task AppliedCommand_IsAuditedUnderTheCallersName_BeforeTheStateShowsIt()
    {
        await using var run = await Run.StartAsync();
        var outcome = await run.Commands.ExecuteAsync(Manager, new DeclarePhase("someone-else", Phase.Active, "fog bank approaching (test)"));
        Assert.Equal(CommandOutcomeKind.Applied, outcome.Kind);
        Assert.NotNull(outcome.AuditSequence);
        var entry = (await LiveClient.EntriesAsync(run.App)).Single(e => e.Sequence == outcome.AuditSequence);
        Assert.Equal("dm.test", entry.Actor);
        Assert.Equal("manual_action", entry.Kind);
        Assert.Equal("active", LiveClient.Phase(await LiveClient.StateAsync(run.App)));

        // ground staff tick only their own team's items (DESIGN R11; policy in CommandAuthorizer)
        var other = await run.Commands.ExecuteAsync(Caller("g.test", Roles.GroundStaff, LiveTestProfile.Team), new TickItem("x", LiveTestProfile.OtherTeam, "ta-1"));
        Assert.Equal(CommandOutcomeKind.Refused, other.Kind);
        var own = await run.Commands.ExecuteAsync(Caller("g.test", Roles.GroundStaff, LiveTestProfile.Team), new TickItem("x", "", "tp-1", "done (test)"));
        Assert.Equal(CommandOutcomeKind.Applied, own.Kind);
        var again = await run.Commands.ExecuteAsync(Manager, new TickItem("x", LiveTestProfile.Team, "tp-1"));
        Assert.Equal(CommandOutcomeKind.Refused, again.Kind); // the engine says it is already done
        var state = await LiveClient.StateAsync(run.App);
        var item = state.GetProperty("items").EnumerateArray().Single(i => i.GetProperty("itemId").GetString() == "tp-1");
        Assert.Equal("g.test", item.GetProperty("tick").GetProperty("user").GetString());
        await LiveClient.AssertChainVerifiesAsync(run.App);
    }

    [Fact]
    public async Task WhenTheAuditCannotBeCommitted_TheCommandIsNotApplied_AndTheUserIsTold()
    {
        await using var run = await Run.StartAsync();
        Assert.Equal(CommandOutcomeKind.Applied, (await run.Commands.ExecuteAsync(Manager, new DeclarePhase("x", Phase.Active, "fog (test)"))).Kind);
        // The hub-read key that reads the state is issued (an audit entry) before the audit is made to fail.
        await LiveClient.ReaderKeyAsync(run.App);
        await run.SqlAsync("CREATE TRIGGER test_fail BEFORE INSERT ON audit_entries BEGIN SELECT RAISE(ABORT, 'test: audit storage failing'); END;");

        var outcome = await run.Commands.ExecuteAsync(Manager, new CancelLvp("x", "fog lifted (test)"));
        Assert.Equal(CommandOutcomeKind.Failed, outcome.Kind);
        Assert.StartsWith(LvpCommandService.NotRecordedMessage, outcome.Message, StringComparison.Ordinal);
        var state = await LiveClient.StateAsync(run.App);
        Assert.Equal("active", LiveClient.Phase(state));
        Assert.Contains(state.GetProperty("status").GetProperty("alarms").EnumerateArray(), a => a.GetProperty("kind").GetString() == "auditStorageFailing");
        Assert.Equal("failing", (await run.App.GetHealthAsync()).GetProperty("engine").GetProperty("audit").GetString());

        await run.SqlAsync("DROP TRIGGER test_fail;");
        var recovered = await run.Commands.ExecuteAsync(Manager, new CancelLvp("x", "fog lifted (test)"));
        Assert.Equal(CommandOutcomeKind.Applied, recovered.Kind);
        var entries = await LiveClient.EntriesAsync(run.App);
        Assert.Single(entries, e => e.Kind == "recording_gap");
        Assert.Equal("ok", (await run.App.GetHealthAsync()).GetProperty("engine").GetProperty("audit").GetString());
        await LiveClient.AssertChainVerifiesAsync(run.App);
    }

    private sealed class Run : IAsyncDisposable
    {
        private readonly string _folder;

        private Run(string folder, OpsLvpApp app)
        {
            _folder = folder;
            App = app;
        }

        public OpsLvpApp App { get; }

        public ILvpCommandService Commands => App.Services.GetRequiredService<ILvpCommandService>();

        public static Task<Run> StartAsync()
        {
            var folder = OpsLvpApp.NewDataFolder();
            return Task.FromResult(new Run(folder, OpsLvpApp.Start(LiveTestProfile.Settings(LiveTestProfile.Write(folder)), folder)));
        }

        public async Task SqlAsync(string sql)
        {
            await using var connection = new SqliteConnection($"Data Source={Path.Combine(_folder, EngineServiceCollectionExtensions.DatabaseFileName)};Pooling=False");
            await connection.OpenAsync();
            await using var command = connection.CreateCommand();
            command.CommandText = sql;
            await command.ExecuteNonQueryAsync();
        }

        public async ValueTask DisposeAsync()
        {
            await App.DisposeAsync();
            OpsLvpApp.TryDelete(_folder);
        }
    }
}
