using OpsLvp.Core.Readings;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Feeds.Demo;

namespace OpsLvp.Web.Tests.Feeds.Demo;

/// <summary>Scenario CSV format is OpsLvp's own (docs/feeds.md). All rows are invented test data.</summary>
public sealed class ScenarioCsvTests
{
    [Fact]
    public void OffsetTimes_AreReadInOrder_CommentsAndBlankLinesSkipped()
    {
        var scenario = ScenarioCsv.Load("""
            # invented test scenario
            time,sensor,kind,value,status

            00:02:00,T1,rvr,600,failed
            00:00:00,T1,rvr,1500,ok
            00:01:00,C1,cloud_base,300,ok
            """, null);

        Assert.Equal(
            [
                new ScenarioReading(TimeSpan.Zero, "T1", ReadingKind.Rvr, 1500, ReadingStatus.Ok),
                new ScenarioReading(TimeSpan.FromMinutes(1), "C1", ReadingKind.CloudBase, 300, ReadingStatus.Ok),
                new ScenarioReading(TimeSpan.FromMinutes(2), "T1", ReadingKind.Rvr, 600, ReadingStatus.Failed),
            ],
            scenario.Readings);
        Assert.Empty(scenario.Rejections);
        Assert.Equal(TimeSpan.FromMinutes(2), scenario.Duration);
    }

    [Fact]
    public void AbsoluteTimes_BecomeOffsetsFromTheEarliestRow()
    {
        var scenario = ScenarioCsv.Load("""
            time,sensor,kind,value,status
            2026-01-15T03:10:00Z,T1,rvr,800,ok
            2026-01-15T04:00:00+01:00,T1,rvr,1200,ok
            """, """
            time,actor,action,target,value,reason
            2026-01-15T03:05:00Z,duty-demo,confirm,active,,invented reason
            """);

        Assert.Equal([TimeSpan.Zero, TimeSpan.FromMinutes(10)], scenario.Readings.Select(r => r.Offset));
        Assert.Equal(TimeSpan.FromMinutes(5), Assert.Single(scenario.Actions).Offset);
    }

    [Fact]
    public void MalformedRows_AreRejectedWithLineNumbers_OthersKept()
    {
        var scenario = ScenarioCsv.Load("""
            time,sensor,kind,value,status
            00:00:00,T1,rvr,1500,ok
            00:01:00,T1,rvr,abc,ok
            00:01:00,T1,haze,1,ok
            00:01:00,T1,rvr
            2026-01-15T03:00:00Z,T1,rvr,700,ok
            """, null);

        Assert.Single(scenario.Readings);
        Assert.Equal([1, 2, 3, 4], scenario.Rejections.Select(r => r.Index));
        Assert.All(scenario.Rejections, r => Assert.Equal(RejectReason.Malformed, r.Reason));
        Assert.Equal("line 3: value 'abc' is not a finite number", scenario.Rejections[0].Detail);
        Assert.StartsWith("line 4: kind 'haze' is not one of", scenario.Rejections[1].Detail, StringComparison.Ordinal);
        Assert.Equal("line 5: expected 5 fields (time,sensor,kind,value,status)", scenario.Rejections[2].Detail);
        Assert.Equal("line 6: time is ISO-8601 but the scenario uses offsets", scenario.Rejections[3].Detail);
    }

    [Fact]
    public void Actions_QuotedReasonWithComma_AndEmptyValue_AreRead()
    {
        var scenario = ScenarioCsv.Load("time,sensor,kind,value,status\n00:00:00,T1,rvr,1500,ok\n",
            "time,actor,action,target,value,reason\n00:03:00,duty-demo,acknowledge,alarm,,\"fog thicker, as \"\"forecast\"\"\"\n00:04:00,,tick,item,,x\n");

        var action = Assert.Single(scenario.Actions);
        Assert.Equal(new ScenarioAction(TimeSpan.FromMinutes(3), "duty-demo", "acknowledge", "alarm", null, "fog thicker, as \"forecast\""), action);
        Assert.Equal("line 3: actor is missing", Assert.Single(scenario.ActionErrors));
        Assert.Equal(TimeSpan.FromMinutes(3), scenario.Duration);
    }

    [Fact]
    public void ActionWithoutATarget_LikeTheDutyManagersConfirm_IsRead()
    {
        // the demo's scripted duty manager confirms active -> cancellation (seed-demo/scenarios/demo-night.actions.csv)
        var scenario = ScenarioCsv.Load("time,sensor,kind,value,status\n00:00:00,T1,rvr,1500,ok\n",
            "time,actor,action,target,value,reason\n00:05:00,r.vale,confirm,,,recovery held (invented)\n");

        Assert.Equal(new ScenarioAction(TimeSpan.FromMinutes(5), "r.vale", "confirm", "", null, "recovery held (invented)"), Assert.Single(scenario.Actions));
        Assert.Empty(scenario.ActionErrors);
    }

    [Theory]
    [InlineData("sensor,time,kind,value,status\n", "readings CSV line 1: header must be 'time,sensor,kind,value,status'")]
    [InlineData("# only a comment\n", "readings CSV is empty: header 'time,sensor,kind,value,status' expected")]
    public void WrongOrMissingHeader_Throws(string csv, string expected)
    {
        var ex = Assert.Throws<FeedFormatException>(() => ScenarioCsv.Load(csv, null));

        Assert.StartsWith(expected, ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void HeaderCase_AndSpacesAroundFields_AreTolerated()
    {
        var scenario = ScenarioCsv.Load("Time, Sensor, Kind, Value, Status\n 00:00:30 , T1 , rvr , 550 , ok \n", null);

        Assert.Equal(new ScenarioReading(TimeSpan.FromSeconds(30), "T1", ReadingKind.Rvr, 550, ReadingStatus.Ok), Assert.Single(scenario.Readings));
    }
}
