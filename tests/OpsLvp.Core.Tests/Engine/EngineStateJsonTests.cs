using System.Text.Json;
using System.Text.Json.Serialization;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Profile;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>The server persists EngineState as JSON for restart recovery: a restored state must behave exactly like the original.</summary>
public class EngineStateJsonTests
{
    public static TheoryData<string> OptionSets => ["default", "web", "profile"];

    private static JsonSerializerOptions Options(string which) => which switch
    {
        "default" => JsonSerializerOptions.Default,
        "web" => new JsonSerializerOptions(JsonSerializerDefaults.Web) { Converters = { new JsonStringEnumConverter() } },
        _ => ProfileLoader.JsonOptions,
    };

    [Theory]
    [MemberData(nameof(OptionSets))]
    public void State_RoundTripsThroughJson_AndContinuesIdentically(string which)
    {
        var options = Options(which);
        var d = new EngineDriver(TestProfiles.Confirming(new TransitionRule(Phase.Preparation, Phase.Active)));
        d.Weather(0, 800);
        d.Run(40, new TickItem("kim (invented)", "airside", "P1", "note, with comma"));
        d.Run(45, new DeclarePhase("dm (invented)", Phase.Preparation, "hold (invented)"), new SetSensorService("dm (invented)", "RVR12T", false, "x"), new SetLightStep("dm (invented)", 0, "lights off (invented)"));
        d.Weather(50, 500);
        d.Run(100, new AcknowledgeAlarm("dm (invented)", "pending"));
        Assert.NotNull(d.State.Pending);
        Assert.NotEmpty(d.State.HoldingSince);
        Assert.NotNull(d.State.ManualLightStep);

        var json = JsonSerializer.Serialize(d.State, options);
        var restored = JsonSerializer.Deserialize<EngineState>(json, options)!;
        Assert.Equal(json, JsonSerializer.Serialize(restored, options));
        Assert.Equal(d.State.ManualLightStep, restored.ManualLightStep); // docs/engine.md R20: the setting survives a restart

        EngineInput[] next = [new ConfirmPending("dm (invented)"), EngineDriver.Rvr(150, "RVR07T", 700)];
        var a = d.Engine.Evaluate(d.State, next, EngineDriver.At(150));
        var b = d.Engine.Evaluate(restored, next, EngineDriver.At(150));
        Assert.Equal(a.Events.Select(EventJson.ToLine), b.Events.Select(EventJson.ToLine));
        Assert.Contains(a.Events, e => e is PhaseTransition);
    }
}
