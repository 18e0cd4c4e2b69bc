using OpsLvp.Core.Engine;
using OpsLvp.Core.Engine.Replay;
using OpsLvp.Core.Readings;

namespace OpsLvp.Core.Tests.Engine.Replay;

/// <summary>The readings and actions CSV formats of docs/replay.md (RFC 4180 quoting).</summary>
public class CsvParsingTests
{
    [Fact]
    public void Readings_ParseEveryKindAndStatus_InFileOrder()
    {
        var text = "time,sensor,kind,value,status\n"
            + "2026-12-01T03:00:00Z,RVR07T,rvr,550,ok\n"
            + "2026-12-01T02:59:00Z,CEIL1,cloud_base,200,degraded\n"
            + "2026-12-01T03:00:00+01:00,T1,transmittance,0.35,failed\n"
            + "\n"
            + "2026-12-01T03:00:00.5Z,B1,background_luminance,1200.5,maintenance\n";
        var r = ReadingsCsv.Parse(text, "r.csv");
        Assert.Equal(4, r.Count);
        Assert.Equal(new Reading(new DateTimeOffset(2026, 12, 1, 3, 0, 0, TimeSpan.Zero), "RVR07T", ReadingKind.Rvr, 550, ReadingStatus.Ok), r[0]);
        Assert.Equal((ReadingKind.CloudBase, ReadingStatus.Degraded), (r[1].Kind, r[1].Status));
        Assert.Equal(new DateTimeOffset(2026, 12, 1, 2, 0, 0, TimeSpan.Zero), r[2].Time);
        Assert.Equal(1200.5, r[3].Value);
    }

    [Theory]
    [InlineData("time,sensor,kind,value\n", "r.csv line 1: header must be")]
    [InlineData("time,sensor,kind,value,status\n2026-12-01T03:00:00,RVR07T,rvr,550,ok\n", "r.csv line 2: bad time")]
    [InlineData("time,sensor,kind,value,status\n2026-12-01T03:00:00Z,RVR07T,fog,550,ok\n", "r.csv line 2: unknown kind 'fog'")]
    [InlineData("time,sensor,kind,value,status\n\n2026-12-01T03:00:00Z,RVR07T,rvr,5x0,ok\n", "r.csv line 3: bad value '5x0'")]
    [InlineData("time,sensor,kind,value,status\n2026-12-01T03:00:00Z,RVR07T,rvr,550,good\n", "r.csv line 2: unknown status 'good'")]
    [InlineData("time,sensor,kind,value,status\n2026-12-01T03:00:00Z,RVR07T,rvr,550\n", "r.csv line 2: expected 5 fields, found 4")]
    [InlineData("", "r.csv: empty file")]
    public void Readings_MalformedLine_NamesFileAndLine(string text, string expected)
    {
        var ex = Assert.Throws<FormatException>(() => ReadingsCsv.Parse(text, "r.csv"));
        Assert.StartsWith(expected, ex.Message);
    }

    [Fact]
    public void Actions_ParseEveryAction_WithQuotedFields()
    {
        var text = "time,actor,action,target,value,reason\n"
            + "2026-12-01T03:00:00Z,Lin,declare,active,,\"fog, thick\"\n"
            + "2026-12-01T03:01:00Z,Lin,cancel,,,\"said \"\"clear\"\"\"\n"
            + "2026-12-01T03:02:00Z,Lin,release_hold,,,r\n"
            + "2026-12-01T03:03:00Z,Lin,forecast,,off,r\n"
            + "2026-12-01T03:04:00Z,Lin,sensor_out,RVR07T,,r\n"
            + "2026-12-01T03:05:00Z,Lin,sensor_in,RVR07T,,r\n"
            + "2026-12-01T03:06:00Z,Lin,confirm,,,\n"
            + "2026-12-01T03:07:00Z,Kim,tick,P1,airside,note\n"
            + "2026-12-01T03:08:00Z,Kim,untick,P1,,mistake\n"
            + "2026-12-01T03:09:00Z,Lin,ack,rvr-unknown,,\n"
            + "2026-12-01T03:10:00Z,Lin,light_step,,0,lights off\n";
        var commands = ActionsCsv.Parse(text, "a.csv").Select(a => a.Command).ToList();
        Assert.Equal<EngineCommand>(
        [
            new DeclarePhase("Lin", Phase.Active, "fog, thick"),
            new CancelLvp("Lin", "said \"clear\""),
            new ReleaseHold("Lin", "r"),
            new SetForecast("Lin", false, "r"),
            new SetSensorService("Lin", "RVR07T", false, "r"),
            new SetSensorService("Lin", "RVR07T", true, "r"),
            new ConfirmPending("Lin"),
            new TickItem("Kim", "airside", "P1", "note"),
            new UntickItem("Kim", "P1", "mistake"),
            new AcknowledgeAlarm("Lin", "rvr-unknown"),
            new SetLightStep("Lin", 0, "lights off"),
        ], commands);
    }

    [Theory]
    [InlineData("2026-12-01T03:00:00Z,Lin,dance,,,r", "a.csv line 2: unknown action 'dance'")]
    [InlineData("2026-12-01T03:00:00Z,Lin,declare,normal,,r", "a.csv line 2: declare target must be preparation or active")]
    [InlineData("2026-12-01T03:00:00Z,Lin,forecast,,maybe,r", "a.csv line 2: forecast value must be on or off")]
    [InlineData("2026-12-01T03:00:00Z,Lin,light_step,,high,r", "a.csv line 2: light_step value must be a whole step number")]
    [InlineData("2026-12-01T03:00:00Z,Lin,light_step,,,r", "a.csv line 2: light_step value must be a whole step number")]
    [InlineData("2026-12-01T03:00:00Z,Lin,tick,P1,,", "a.csv line 2: value (team id) is empty")]
    [InlineData("2026-12-01T03:00:00Z,Lin,cancel,,,\"open", "a.csv line 2: unterminated quoted field")]
    public void Actions_MalformedLine_NamesFileAndLine(string line, string expected)
    {
        var ex = Assert.Throws<FormatException>(() => ActionsCsv.Parse("time,actor,action,target,value,reason\n" + line + "\n", "a.csv"));
        Assert.StartsWith(expected, ex.Message);
    }
}
