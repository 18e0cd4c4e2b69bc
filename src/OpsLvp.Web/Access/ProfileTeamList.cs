using OpsLvp.Core.Profile;
using OpsLvp.Web.Engine;

namespace OpsLvp.Web.Access;

/// <summary>
/// The teams of the aerodrome profile the engine runs (or an <see cref="AerodromeProfile"/> registered in the
/// container): the only teams an account may be put in, so a ground-staff member always sees the items of a real team.
/// </summary>
public sealed class ProfileTeamList(IServiceProvider services)
{
    /// <summary>The profile's teams, or null while no profile is loaded.</summary>
    public IReadOnlyList<TeamConfig>? Teams =>
        (services.GetService<AerodromeProfile>() ?? services.GetService<LiveEngineHost>()?.Profile)?.Teams;
}
