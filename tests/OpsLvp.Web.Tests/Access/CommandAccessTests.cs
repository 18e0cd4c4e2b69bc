using System.Runtime.CompilerServices;
using OpsLvp.Core.Engine;
using OpsLvp.Core.Profile;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Hosting;

namespace OpsLvp.Web.Tests.Access;

/// <summary>
/// Role × command at the service layer's policy table (<see cref="CommandAuthorizer"/>): every concrete engine
/// command (found by reflection) has a policy, and each role, anonymous and a revoked (anonymous) circuit get the
/// expected allow/deny. Items and teams are from the invented seed-demo profile.
/// </summary>
public sealed class CommandAccessTests
{
    private static readonly AerodromeProfile Profile =
        ProfileLoader.Load(new ContentPaths(AppContext.BaseDirectory).Resolve("seed-demo/profile.json"));

    public static IEnumerable<Type> CommandTypes() =>
        typeof(EngineCommand).Assembly.GetTypes().Where(t => t.IsSubclassOf(typeof(EngineCommand)) && !t.IsAbstract);

    [Fact]
    public void EveryEngineCommand_HasAPolicy()
    {
        var missing = CommandTypes().Where(t => !CommandAuthorizer.Policy.ContainsKey(t)).Select(t => t.Name).ToList();

        Assert.True(missing.Count == 0, "commands without a policy: " + string.Join(", ", missing));
        Assert.NotEmpty(CommandTypes());
    }

    [Fact]
    public void Matrix_EveryCommandForEveryRole_AnonymousAndRevoked()
    {
        var problems = new List<string>();
        foreach (var type in CommandTypes())
        {
            var command = type == typeof(TickItem) ? new TickItem("x", "airside-ops", "prep-works-stop")
                : type == typeof(UntickItem) ? new UntickItem("x", "prep-works-stop", "wrong item (invented)")
                : (EngineCommand)RuntimeHelpers.GetUninitializedObject(type);
            var isItem = type == typeof(TickItem) || type == typeof(UntickItem);
            Expect(problems, command, Caller(Roles.DutyManager), allowed: true);
            Expect(problems, command, Caller(Roles.GroundStaff, "airside-ops"), allowed: isItem);
            Expect(problems, command, Caller(Roles.GroundStaff, "rescue-fire"), allowed: false);
            Expect(problems, command, Caller(Roles.Administrator), allowed: false);
            Expect(problems, command, Caller(Roles.Viewer), allowed: false);
            Expect(problems, command, CommandCaller.Anonymous, allowed: false);
            // A circuit whose role was removed or user disabled is revalidated to anonymous (LiveRevocationTests).
            Expect(problems, command, CommandCaller.FromPrincipal(AccessApp.Anonymous), allowed: false);
        }

        Assert.True(problems.Count == 0, string.Join("\n", problems));
    }

    [Fact]
    public void GroundStaff_ReportOnlyTheirOwnTeamsFacilities_AsThatTeam()
    {
        // demo profile: tdzl-07l belongs to field-lighting (docs/capability.md; invented)
        var report = new SetFacilityStatus("x", "tdzl-07l", Core.Capability.FacilityStatus.Unserviceable, "circuit fault (invented)", "field-lighting");

        Assert.Null(CommandAuthorizer.Check(Caller(Roles.GroundStaff, "field-lighting"), report, Profile));
        Assert.Equal("facility tdzl-07l is reported by another team", CommandAuthorizer.Check(Caller(Roles.GroundStaff, "airside-ops"), report, Profile));
        Assert.Equal("facility tdzl-07l is reported by another team", CommandAuthorizer.Check(Caller(Roles.GroundStaff, "field-lighting"), report with { Team = null }, Profile));
        Assert.Null(CommandAuthorizer.Check(Caller(Roles.DutyManager), report with { Team = null }, Profile));
        Assert.Equal("your role does not allow you to change the runway in use", CommandAuthorizer.Check(Caller(Roles.GroundStaff, "field-lighting"), new SetRunwayInUse("x", "07L/25R", "25R", "r"), Profile));
    }

    private static CommandCaller Caller(string role, params string[] teams) =>
        new("someone", new HashSet<string> { role }, teams.ToHashSet(), true);

    private static void Expect(List<string> problems, EngineCommand command, CommandCaller caller, bool allowed)
    {
        var refusal = CommandAuthorizer.Check(caller, command, Profile);
        if ((refusal is null) != allowed)
        {
            problems.Add($"{command.GetType().Name} for {string.Join("+", caller.Roles)} [{string.Join(",", caller.Teams)}]: expected {(allowed ? "allow" : "deny")}, got {refusal ?? "allow"}");
        }
    }
}
