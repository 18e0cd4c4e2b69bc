using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Core.Readings;
using OpsLvp.Web.Live;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Console;

/// <summary>
/// A real Core engine for console tests: an invented profile ("Demo Field (invented)", runway 07/25 with RVR at TDZ and
/// MID, one ceilometer; preparation below 1000 m, recovers at 1100 m; active below 550 m, recovers at 650 m; entry
/// dwells 30 s; the same illustrative thresholds as <see cref="TestSnapshots.Thresholds"/>), driven by invented readings.
/// </summary>
public sealed class ConsoleEngine
{
    public static readonly AerodromeProfile Profile = new()
    {
        Version = "console-test-1 (invented)",
        InForceNeedsSafeguards = false,
        Aerodrome = new AerodromeInfo("XDMO", "Demo Field (invented)", Illustrative: true),
        Runways = [new RunwayConfig("07/25", ["07", "25"])],
        Sensors =
        [
            new SensorConfig("RVR07T", SensorType.RvrSystem, "07/25", new Dictionary<string, RvrPosition> { ["07"] = RvrPosition.Tdz, ["25"] = RvrPosition.End }),
            new SensorConfig("RVR07M", SensorType.RvrSystem, "07/25", new Dictionary<string, RvrPosition> { ["07"] = RvrPosition.Mid, ["25"] = RvrPosition.Mid }),
            new SensorConfig("CEIL1", SensorType.Ceilometer),
        ],
        Teams = [new TeamConfig("airside", "Airside Ops (invented)"), new TeamConfig("lighting", "AGL Crew (invented)")],
        MaxAgeSeconds = new Dictionary<ReadingKind, int> { [ReadingKind.Rvr] = 600, [ReadingKind.CloudBase] = 600 },
        Thresholds = TestSnapshots.Thresholds,
        Checklists = new ChecklistSet
        {
            Preparation = [new ChecklistItemConfig("P1", "Suspend airside works (invented)", "airside", true, 10)],
            Active = [new ChecklistItemConfig("A1", "Confirm stop bars lit (invented)", "lighting", true, 5)],
            Cancellation = [new ChecklistItemConfig("C1", "Release vehicle restrictions (invented)", "airside", true, 10)],
        },
    };

    public LvpEngine Engine { get; } = new(Profile);

    public EngineState State { get; private set; }

    public DateTimeOffset Now { get; private set; } = TestSnapshots.T0;

    public ConsoleEngine() => State = Engine.Initial(TestSnapshots.T0);

    /// <summary>RVR <paramref name="metres"/> at TDZ and MID and a 5000 ft ceiling every 10 s for <paramref name="seconds"/>.</summary>
    public ConsoleEngine Weather(double metres, int seconds)
    {
        for (var t = 0; t <= seconds; t += 10)
        {
            var at = Now.AddSeconds(t == 0 ? 0 : 10);
            Now = at;
            State = Engine.Evaluate(State,
            [
                new ReadingInput(new Reading(at, "RVR07T", ReadingKind.Rvr, metres)),
                new ReadingInput(new Reading(at, "RVR07M", ReadingKind.Rvr, metres)),
                new ReadingInput(new Reading(at, "CEIL1", ReadingKind.CloudBase, 5000)),
            ], at).State;
        }
        return this;
    }

    /// <summary>The snapshot the console shows: the engine's own status now.</summary>
    public LiveSnapshot Snapshot(long version) => TestSnapshots.Make(version, State.Phase, at: Now) with { Status = Engine.Describe(State, Now) };
}
