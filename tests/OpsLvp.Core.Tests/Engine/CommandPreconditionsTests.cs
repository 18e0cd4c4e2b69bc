using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// docs/engine.md R9: what a command must carry is checked in one place, with one wording for the engine and the
/// web command service. Items, sensors and people are the invented test profile's.
/// </summary>
public class CommandPreconditionsTests
{
    private static readonly (EngineCommand Command, string Expected)[] Incomplete =
    [
        (new DeclarePhase("dm", Phase.Normal, "x"), "only LVP preparation or LVP in force can be declared, not Normal operations"),
        (new DeclarePhase("dm", Phase.Active, " "), "a reason is required to declare a phase"),
        (new CancelLvp("dm", ""), "a reason is required to cancel"),
        (new ReleaseHold("dm", ""), "a reason is required to release a hold"),
        (new SetForecast("dm", true, ""), "a reason is required to set or clear the forecast"),
        (new SetSensorService("dm", "NOPE", false, "fault"), "unknown sensor 'NOPE'"),
        (new TickItem("kim", "airside", "NOPE"), "unknown item 'NOPE'"),
        (new TickItem("kim", "lighting", "P1"), "item P1 belongs to team airside, not lighting"),
        (new UntickItem("kim", "P1", ""), "a reason is required to undo a tick"),
        (new MarkNotApplicable("dm", "P1", ""), "a reason is required to mark an item not applicable"),
        (new AcknowledgeAlarm("dm", ""), "no alarm named"),
    ];

    [Fact]
    public void IncompleteCommand_IsRefusedByTheEngineInTheSameWords()
    {
        foreach (var (command, expected) in Incomplete)
        {
            Assert.Equal(expected, CommandPreconditions.Check(command, TestProfiles.Standard()));
            var d = new EngineDriver();
            var refused = Assert.Single(d.Run(1, command).OfType<CommandRefused>());
            Assert.Equal(expected, refused.Reason);
        }
    }

    [Fact]
    public void CompleteCommand_PassesThePreconditions()
    {
        Assert.Null(CommandPreconditions.Check(new TickItem("kim", "airside", "P1"), TestProfiles.Standard()));
        Assert.Null(CommandPreconditions.Check(new ConfirmPending("dm"), TestProfiles.Standard()));
    }
}
