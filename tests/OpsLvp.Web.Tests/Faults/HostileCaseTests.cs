using System.Text;
using OpsLvp.FaultCases;

namespace OpsLvp.Web.Tests.Faults;

/// <summary>
/// The fault suite's generator and judge are themselves checked: every case is generated, bodies are reproducible, and
/// the judge calls a wrong answer wrong (a 5xx, a 202 for a body that must be refused, a wrong item outcome, a refusal
/// without a reason), so a run with 0 breaks means something. Bodies are invented.
/// </summary>
public sealed class HostileCaseTests
{
    private static readonly DateTimeOffset s_now = new(2026, 1, 15, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public void EveryCase_IsGenerated_InTurn_AndTheSameIndexGivesTheSameBytes()
    {
        var names = Enumerable.Range(0, HostileBodies.Cases.Count).Select(i => HostileBodies.Make(1, i, s_now).Case).ToList();

        Assert.Equal(HostileBodies.Cases, names);
        Assert.Equal(HostileBodies.Make(3, 1234, s_now).Body, HostileBodies.Make(3, 1234, s_now).Body);
        Assert.NotEqual(HostileBodies.Make(3, 1234, s_now).Body, HostileBodies.Make(4, 1234, s_now).Body);
    }

    [Fact]
    public void EveryBody_SaysWhatACorrectAnswerIs()
    {
        for (var i = 0; i < 2_000; i++)
        {
            var body = HostileBodies.Make(5, i, s_now);
            Assert.True(body.ExpectedItems is not null || body.RefusedWith is { Count: > 0 }, $"body {i} ({body.Case}) has no expectation");
        }
    }

    [Fact]
    public void Judge_CallsA5xxABreak_EvenWhereA4xxWasExpected()
    {
        var refused = Body("duplicate-document-key", items: null, refused: [400]);

        Assert.Contains("500", HostileAnswer.Check(refused, 500, "{\"error\":\"boom\"}"), StringComparison.Ordinal);
        Assert.Null(HostileAnswer.Check(refused, 400, "{\"error\":\"body names \\\"readings\\\" more than once\"}"));
    }

    [Fact]
    public void Judge_CallsARefusalWithoutAReason_ABreak()
    {
        var refused = Body("not-json", items: null, refused: [400]);

        Assert.NotNull(HostileAnswer.Check(refused, 400, ""));
        Assert.NotNull(HostileAnswer.Check(refused, 400, "{\"error\":\"\"}"));
    }

    [Fact]
    public void Judge_CallsA202ForABodyThatMustBeRefused_ABreak()
    {
        var refused = Body("invalid-utf8", items: null, refused: [400]);

        Assert.NotNull(HostileAnswer.Check(refused, 202, "{\"accepted\":0,\"items\":[]}"));
    }

    [Fact]
    public void Judge_Checks202ItemByItem()
    {
        var body = Body("mixed-items", items: [true, false], refused: null);
        const string Right = """{"accepted":1,"items":[{"index":0,"outcome":"accepted"},{"index":1,"outcome":"rejected","reason":"out_of_range","detail":"-1 outside 0..10000 for Rvr"}]}""";
        const string Swapped = """{"accepted":1,"items":[{"index":0,"outcome":"rejected","reason":"x","detail":"y"},{"index":1,"outcome":"accepted"}]}""";
        const string NoReason = """{"accepted":1,"items":[{"index":0,"outcome":"accepted"},{"index":1,"outcome":"rejected"}]}""";
        const string Missing = """{"accepted":1,"items":[{"index":0,"outcome":"accepted"}]}""";

        Assert.Null(HostileAnswer.Check(body, 202, Right));
        Assert.NotNull(HostileAnswer.Check(body, 202, Swapped));
        Assert.NotNull(HostileAnswer.Check(body, 202, NoReason));
        Assert.NotNull(HostileAnswer.Check(body, 202, Missing));
    }

    private static HostileBody Body(string name, bool[]? items, int[]? refused) =>
        new(name, Encoding.UTF8.GetBytes("{}"), "application/json", true, items, refused);
}
