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
    public async Task LightStep_IsTheDutyManagers_Audited_AndApiStateShowsTheStepAndWhoSetIt()
    {
        // docs/engine.md R20; the test profile configures step 5 only (invented)
        await using var run = await Run.StartAsync();
        var before = await LiveClient.StateAsync(run.App);
        Assert.Equal("profile", before.GetProperty("lightStep").GetProperty("origin").GetString());
        Assert.Equal(5, before.GetProperty("lightStep").GetProperty("step").GetDouble());
        Assert.Equal([0, 5], before.GetProperty("lightSteps").EnumerateArray().Select(e => e.GetInt32()));

        var viewer = await run.Commands.ExecuteAsync(Caller("v.test", Roles.Viewer), new SetLightStep("x", 0, "lights off (test)"));
        Assert.Equal(CommandOutcomeKind.Refused, viewer.Kind);
        Assert.Contains("role", viewer.Message, StringComparison.Ordinal);
        var ground = await run.Commands.ExecuteAsync(Caller("g.test", Roles.GroundStaff, LiveTestProfile.Team), new SetLightStep("x", 0, "lights off (test)"));
        Assert.Equal(CommandOutcomeKind.Refused, ground.Kind);
        var unknown = await run.Commands.ExecuteAsync(Manager, new SetLightStep("x", 3, "step 3 (test)"));
        Assert.Equal(CommandOutcomeKind.Refused, unknown.Kind);
        Assert.Contains("light step 3 is not configured", unknown.Message, StringComparison.Ordinal);
        var blank = await run.Commands.ExecuteAsync(Manager, new SetLightStep("x", 0, " "));
        Assert.Equal(CommandOutcomeKind.Refused, blank.Kind);
        Assert.Contains("reason", blank.Message, StringComparison.Ordinal);

        var outcome = await run.Commands.ExecuteAsync(Manager, new SetLightStep("someone-else", 0, "runway lights failed (test)"));
        Assert.Equal(CommandOutcomeKind.Applied, outcome.Kind);
        var entry = (await LiveClient.EntriesAsync(run.App)).Single(e => e.Sequence == outcome.AuditSequence);
        Assert.Equal(("dm.test", "manual_action"), (entry.Actor, entry.Kind));
        Assert.Contains("\"light_step\"", entry.PayloadJson, StringComparison.Ordinal);
        Assert.Contains("runway lights failed (test)", entry.PayloadJson, StringComparison.Ordinal);
        var after = (await LiveClient.StateAsync(run.App)).GetProperty("lightStep");
        Assert.Equal("manual", after.GetProperty("origin").GetString());
        Assert.Equal(0, after.GetProperty("step").GetDouble());
        Assert.Equal("dm.test", after.GetProperty("source").GetString());
        await LiveClient.AssertChainVerifiesAsync(run.App);
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

        // ground staff tick only their own team's items (docs/engine.md R11; policy in CommandAuthorizer)
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
    public async Task WithSafeguardsOpen_ApiStateSaysSo_NotApplicableAndOverrideGoThroughTheServiceAndTheAudit()
    {
        // docs/engine.md R13 with the test profile's rule on: tp-1 is its one mandatory preparation item (invented)
        await using var run = await Run.StartAsync(inForceNeedsSafeguards: true);
        var refused = await run.Commands.ExecuteAsync(Manager, new DeclarePhase("x", Phase.Active, "fog bank approaching (test)"));
        Assert.Equal(CommandOutcomeKind.Refused, refused.Kind);
        Assert.Equal("safeguards incomplete: tp-1 open; declare active with an override reason to enter it anyway", refused.Message);

        var now = DateTimeOffset.UtcNow;
        await LiveClient.PushAsync(run.App, LiveClient.Item(now, LiveTestProfile.Tdz, "rvr", 300), LiveClient.Item(now, LiveTestProfile.Mid, "rvr", 300));
        var state = await LiveClient.WaitForPhaseAsync(run.App, "preparation");
        var deadline = DateTime.UtcNow + TimeSpan.FromSeconds(30);
        while (!state.GetProperty("status").GetProperty("conditionsMetSafeguardsIncomplete").GetBoolean() && DateTime.UtcNow < deadline)
        {
            await Task.Delay(50);
            state = await LiveClient.StateAsync(run.App);
        }
        Assert.True(state.GetProperty("status").GetProperty("conditionsMetSafeguardsIncomplete").GetBoolean());
        Assert.Equal(["tp-1"], state.GetProperty("status").GetProperty("safeguardsOutstanding").EnumerateArray().Select(e => e.GetString()));

        var blank = await run.Commands.ExecuteAsync(Manager, new MarkNotApplicable("x", "tp-1", " "));
        Assert.Equal("a reason is required to mark an item not applicable", blank.Message);
        var ground = await run.Commands.ExecuteAsync(Caller("g.test", Roles.GroundStaff, LiveTestProfile.Team), new MarkNotApplicable("x", "tp-1", "no works tonight (test)"));
        Assert.Equal(CommandOutcomeKind.Refused, ground.Kind);
        var marked = await run.Commands.ExecuteAsync(Manager, new MarkNotApplicable("x", "tp-1", "no works tonight (test)"));
        Assert.Equal(CommandOutcomeKind.Applied, marked.Kind);
        await LiveClient.WaitForPhaseAsync(run.App, "active");
        var entries = await LiveClient.EntriesAsync(run.App);
        Assert.Contains(entries, e => e.Kind == "item_not_applicable" && e.Actor == "dm.test");
        await LiveClient.AssertChainVerifiesAsync(run.App);
    }

    [Fact]
    public async Task DeclaringActiveOverOpenSafeguards_IsAppliedWithTheOverrideAudited()
    {
        await using var run = await Run.StartAsync(inForceNeedsSafeguards: true);
        var outcome = await run.Commands.ExecuteAsync(Manager, new DeclarePhase("x", Phase.Active, "fog bank approaching (test)", "tower asks for LVP now (test)"));
        Assert.Equal(CommandOutcomeKind.Applied, outcome.Kind);
        var state = await LiveClient.WaitForPhaseAsync(run.App, "active");
        Assert.Equal("dm.test", state.GetProperty("status").GetProperty("safeguardsOverride").GetProperty("actor").GetString());
        Assert.Contains(await LiveClient.EntriesAsync(run.App), e => e.Kind == "manual_action" && e.PayloadJson.Contains("override_safeguards", StringComparison.Ordinal));
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

        public static Task<Run> StartAsync(bool inForceNeedsSafeguards = false)
        {
            var folder = OpsLvpApp.NewDataFolder();
            var profile = LiveTestProfile.Write(folder, inForceNeedsSafeguards: inForceNeedsSafeguards);
            return Task.FromResult(new Run(folder, OpsLvpApp.Start(LiveTestProfile.Settings(profile), folder)));
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
