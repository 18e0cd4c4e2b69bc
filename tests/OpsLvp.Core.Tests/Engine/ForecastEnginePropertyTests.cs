using System.Globalization;
using CsCheck;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Forecast;

namespace OpsLvp.Core.Tests.Engine;

/// <summary>
/// Property tests (CsCheck) of docs/engine.md R25–R28 over random invented TAFs and TRENDs for the invented XDMO, duty
/// manager settings and releases, and gaps of up to 3 h: expired forecasts never count, a manual setting wins until
/// released or a newer forecast arrives, the flag is what <see cref="ForecastTrigger"/> says of the forecasts held, and a
/// newest forecast that forecasts no deterioration over the whole look-ahead clears the flag. The settings are
/// <see cref="ForecastEngineTests.Settings"/> (invented, illustrative).
/// </summary>
public sealed class ForecastEnginePropertyTests
{
    private const int Iterations = 120;

    /// <summary>
    /// One instant, <see cref="Gap"/> minutes after the one before. <see cref="Kind"/>: 0 tick, 1 TAF, 2 TREND, 3 set on,
    /// 4 set off, 5 release, 6 a clear TAF covering the next 24 h. TAF/TREND shape: validity hours, group kind, start
    /// offset, length and visibility.
    /// </summary>
    public sealed record Step(int Gap, int Kind, int ValidHours, int Group, int Offset, int Length, int Visibility);

    private static readonly Gen<Step> StepGen = Gen.Select(Gen.Int[1, 180], Gen.Int[0, 6], Gen.Int[2, 24], Gen.Int[0, 4], Gen.Int[0, 10], Gen.Int[1, 4], Gen.Int[0, 3])
        .Select(x => new Step(x.Item1, x.Item2, x.Item3, x.Item4, x.Item5, x.Item6, x.Item7));

    private static readonly string[] Visibilities = ["0300 FG", "0800 BR", "3000 BR", "9999"];
    private static readonly string[] Groups = ["TEMPO", "BECMG", "PROB30", "PROB40", "PROB30 TEMPO"];

    private static string Ddhh(DateTimeOffset t) => t.ToString("ddHH", CultureInfo.InvariantCulture);

    private static ForecastInput? Input(Step s, DateTimeOffset now)
    {
        var issued = new DateTimeOffset(now.Year, now.Month, now.Day, now.Hour, now.Minute, 0, TimeSpan.Zero);
        var from = issued.AddMinutes(-issued.Minute);
        var vis = Visibilities[s.Visibility];
        switch (s.Kind)
        {
            case 1:
                {
                    var until = from.AddHours(s.ValidHours);
                    var groupFrom = from.AddHours(Math.Min(s.Offset, s.ValidHours - 1));
                    var groupUntil = groupFrom.AddHours(s.Length) > until ? until : groupFrom.AddHours(s.Length);
                    var text = $"TAF XDMO {issued:ddHHmm}Z {Ddhh(from)}/{Ddhh(until)} 24005KT 9999 SCT030 {Groups[s.Group]} {Ddhh(groupFrom)}/{Ddhh(groupUntil)} {vis}";
                    return new ForecastInput(ForecastOrigin.Taf, text, now);
                }
            case 2:
                {
                    var trend = s.Group % 3 == 0 ? "NOSIG" : $"{(s.Group % 3 == 1 ? "TEMPO" : "BECMG")} FM{issued.AddMinutes(30 * s.Length):HHmm} {vis}";
                    return new ForecastInput(ForecastOrigin.Trend, $"METAR XDMO {issued:ddHHmm}Z 24005KT 6000 BR SCT030 08/07 Q1020 {trend}", now);
                }
            case 6:
                return new ForecastInput(ForecastOrigin.Taf, $"TAF XDMO {issued:ddHHmm}Z {Ddhh(from)}/{Ddhh(from.AddHours(24))} 24005KT 9999 NSC", now);
            default:
                return null;
        }
    }

    private static EngineInput? Command(Step s) => s.Kind switch
    {
        3 => new SetForecast("dm (invented)", true, "judgement (invented)"),
        4 => new SetForecast("dm (invented)", false, "judgement (invented)"),
        5 => new ReleaseForecast("dm (invented)", "judgement (invented)"),
        _ => null,
    };

    /// <summary>Runs the steps, calling <paramref name="check"/> after each with the state before, the input and the result.</summary>
    private static void Drive(Step[] steps, Action<EngineState, EngineInput?, EngineDriver, IReadOnlyList<EngineEvent>, DateTimeOffset> check)
    {
        var d = new EngineDriver(ForecastEngineTests.Profile());
        var t = 0.0;
        foreach (var s in steps)
        {
            t += s.Gap * 60;
            var now = EngineDriver.At(t);
            EngineInput? input = (EngineInput?)Input(s, now) ?? Command(s);
            var before = d.State;
            var events = input is null ? d.Run(t) : d.Run(t, input);
            check(before, input, d, events, now);
        }
    }

    private static ResolvedForecast Place(HeldForecast h) =>
        LvpEngine.TryPlace(new ForecastInput(h.Origin, h.Text, h.ReceivedAt), out var r, out var error) ? r! : throw new InvalidOperationException(error);

    [Fact]
    public void ExpiredForecasts_NeverCount_NorStayHeld() =>
        StepGen.Array[1, 30].Sample(steps => Drive(steps, (_, _, d, events, now) =>
        {
            Assert.All(d.State.Forecasts, h => Assert.True(h.ValidUntil > now, $"held after expiry: {h.Text}"));
            if (d.State.ForecastSource is { Manual: false, ReportText: { } report })
            {
                Assert.Contains(d.State.Forecasts, h => h.Text == report && h.ValidUntil > now);
            }
            if (d.State.ForecastSource is { Manual: false, Until: { } until })
            {
                Assert.True(until > now, "the part that sets the flag has ended");
            }
        }), iter: Iterations);

    [Fact]
    public void ManualSetting_WinsUntilReleasedOrANewerForecastArrives() =>
        StepGen.Array[1, 30].Sample(steps => Drive(steps, (before, input, d, events, _) =>
        {
            if (d.State.ManualForecast is { } manual)
            {
                Assert.Equal(manual.On, d.State.DeteriorationForecast);
                Assert.True(d.State.ForecastSource!.Manual);
            }
            if (before.ManualForecast is { } was)
            {
                var newer = events.OfType<ForecastReceived>().Any(r => r.IssuedAt > was.At);
                var released = input is ReleaseForecast;
                var replaced = input is SetForecast && d.State.ManualForecast is not null;
                Assert.Equal(newer || released, d.State.ManualForecast is null && !replaced);
            }
        }), iter: Iterations);

    [Fact]
    public void WithoutManualSetting_TheFlagIsWhatTheTriggerSaysOfTheForecastsHeld() =>
        StepGen.Array[1, 30].Sample(steps => Drive(steps, (_, _, d, _, now) =>
        {
            if (d.State.ManualForecast is null)
            {
                var expected = ForecastTrigger.Evaluate(
                    d.State.Forecasts.Select(Place), now, ForecastEngineTests.Settings());
                Assert.Equal(expected.On, d.State.DeteriorationForecast);
                Assert.Equal(expected.Source?.ShortForm, d.State.ForecastSource?.ShortForm);
            }
        }), iter: Iterations);

    [Fact]
    public void NewestForecastThatClearsTheWholeLookAhead_TurnsTheFlagOff() =>
        StepGen.Array[1, 30].Sample(steps => Drive(steps, (_, input, d, events, _) =>
        {
            if (input is ForecastInput { Origin: ForecastOrigin.Taf } f && f.Text.EndsWith("NSC", StringComparison.Ordinal)
                && events.OfType<ForecastReceived>().Any() && d.State.ManualForecast is null)
            {
                Assert.False(d.State.DeteriorationForecast, f.Text);
            }
        }), iter: Iterations);
}
