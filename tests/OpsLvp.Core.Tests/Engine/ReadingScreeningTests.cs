using OpsLvp.Core.Engine;
using OpsLvp.Core.Readings;
using static OpsLvp.Core.Tests.Engine.EngineDriver;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>docs/engine.md R1 (screening) and R2 (supersession, arrival order). Ranges are ReadingScreen's documented choice (common practice).</summary>
public class ReadingScreeningTests
{
    private static ReadingRejected RejectOne(Reading reading, double at = 10)
    {
        var d = new EngineDriver();
        var events = d.Run(at, new ReadingInput(reading));
        Assert.False(d.State.Latest.ContainsKey(EngineState.SensorKey(reading.SensorId, reading.Kind)));
        return Assert.Single(events.OfType<ReadingRejected>());
    }

    [Theory]
    [InlineData(ReadingStatus.Degraded)]
    [InlineData(ReadingStatus.Failed)]
    [InlineData(ReadingStatus.Maintenance)]
    public void Reading_WithNonOkStatus_IsRejectedAndNeverReachesState(ReadingStatus status)
    {
        var r = RejectOne(new Reading(At(10), "RVR07T", ReadingKind.Rvr, 300, status));
        Assert.Equal(RejectReason.StatusNotOk, r.Reason);
    }

    [Theory]
    [InlineData(ReadingKind.Rvr, "RVR07T", -1)]
    [InlineData(ReadingKind.Rvr, "RVR07T", 10_001)]
    [InlineData(ReadingKind.Rvr, "RVR07T", double.NaN)]
    [InlineData(ReadingKind.CloudBase, "CEIL1", 50_001)]
    [InlineData(ReadingKind.Extinction, "RVR25T", -0.5)]
    public void Reading_OutsideItsPhysicalRange_IsRejected(ReadingKind kind, string sensor, double value)
    {
        var r = RejectOne(new Reading(At(10), sensor, kind, value));
        Assert.Equal(RejectReason.OutOfRange, r.Reason);
    }

    [Fact]
    public void Reading_TimedBeyondTheFutureSkew_IsRejected()
    {
        // profile.FutureSkewSeconds = 5 (default): 6 s ahead is rejected, 5 s ahead accepted
        var r = RejectOne(new Reading(At(16), "RVR07T", ReadingKind.Rvr, 300), at: 10);
        Assert.Equal(RejectReason.FutureDated, r.Reason);
        var d = new EngineDriver();
        Assert.Empty(d.Run(10, Rvr(15, "RVR07T", 300)).OfType<ReadingRejected>());
    }

    [Fact]
    public void Reading_FromASensorNotInTheProfile_IsRejected()
    {
        Assert.Equal(RejectReason.UnknownSensor, RejectOne(new Reading(At(10), "RVR99X", ReadingKind.Rvr, 300)).Reason);
    }

    [Fact]
    public void Reading_OfAKindTheSensorTypeDoesNotProduce_IsRejected()
    {
        var r = RejectOne(new Reading(At(10), "CEIL1", ReadingKind.Rvr, 300));
        Assert.Equal(RejectReason.KindNotProduced, r.Reason);
    }

    [Fact]
    public void Reading_WithSameSensorKindAndTime_IsRejectedAsDuplicate()
    {
        var d = new EngineDriver();
        d.Run(10, Rvr(10, "RVR07T", 800));
        var r = Assert.Single(d.Run(11, Rvr(10, "RVR07T", 300)).OfType<ReadingRejected>());
        Assert.Equal(RejectReason.Duplicate, r.Reason);
        Assert.Equal(800, d.State.Latest[EngineState.SensorKey("RVR07T", ReadingKind.Rvr)].Value);
    }

    [Fact]
    public void Reading_OlderThanTheSensorsLatest_IsIgnoredForState()
    {
        var d = new EngineDriver();
        d.Run(20, Rvr(20, "RVR07T", 1500));
        var r = Assert.Single(d.Run(21, Rvr(15, "RVR07T", 300)).OfType<ReadingRejected>());
        Assert.Equal(RejectReason.OlderThanLatest, r.Reason);
        Assert.Equal(1500, d.State.Latest[EngineState.SensorKey("RVR07T", ReadingKind.Rvr)].Value);
    }

    [Fact]
    public void Reading_NewerThanTheLatest_SupersedesIt()
    {
        var d = new EngineDriver();
        d.Run(20, Rvr(20, "RVR07T", 1500));
        d.Run(30, Rvr(30, "RVR07T", 900));
        Assert.Equal(900, d.State.Latest[EngineState.SensorKey("RVR07T", ReadingKind.Rvr)].Value);
    }

    [Fact]
    public void RejectedLowReading_DoesNotEscalate()
    {
        var d = new EngineDriver();
        d.Weather(0, 1500);
        d.Run(10, new ReadingInput(new Reading(At(10), "RVR07T", ReadingKind.Rvr, 100, ReadingStatus.Failed)));
        d.Run(100);
        Assert.Empty(d.Transitions);
    }
}
