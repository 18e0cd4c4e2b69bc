using System.Security.Claims;
using System.Text.RegularExpressions;
using Microsoft.AspNetCore.Identity;
using Microsoft.EntityFrameworkCore;
using OpsLvp.Data.Entities;
using OpsLvp.Data.Stores;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Access;

/// <summary>
/// Account administration (the /admin/users page and the first-start setup). Every change is checked first, then
/// written to the audit chain, then applied; when the audit entry cannot be committed nothing is changed. Role, team
/// and enable/disable changes renew the security stamp so open sessions end at the next revalidation.
/// </summary>
public sealed partial class UserAdmin(UserManager<OpsLvpUser> users, AccessAudit audit, TimeProvider clock, SetupGate setup, ProfileTeamList profileTeams)
{
    public async Task<IReadOnlyList<UserSummary>> ListAsync(CancellationToken cancellationToken = default)
    {
        var all = await users.Users.AsNoTracking().OrderBy(u => u.UserName).ToListAsync(cancellationToken);
        var list = new List<UserSummary>(all.Count);
        foreach (var user in all)
        {
            list.Add(await SummaryAsync(user));
        }
        return list;
    }

    /// <summary>Creates an account with one or more roles (ground staff need at least one team).</summary>
    public async Task<UserAdminResult> CreateAsync(string actor, string userName, string displayName, string password, IReadOnlyCollection<string> roles, IReadOnlyCollection<string> teams, CancellationToken cancellationToken = default)
    {
        var name = userName.Trim();
        var problems = CheckRolesAndTeams(roles, teams);
        if (!UserNamePattern().IsMatch(name))
        {
            problems.Add((UserAdminFields.UserName, "user name: 2 to 64 characters, letters, digits, '.', '-' or '_'"));
        }
        else if (await users.FindByNameAsync(name) is not null)
        {
            problems.Add((UserAdminFields.UserName, $"user name '{name}' is taken"));
        }
        var user = new OpsLvpUser { UserName = name, DisplayName = displayName.Trim(), CreatedAt = clock.GetUtcNow() };
        problems.AddRange((await PasswordProblemsAsync(user, password)).Select(m => (UserAdminFields.Password, m)));
        if (problems.Count > 0)
        {
            return UserAdminResult.Refused(problems);
        }
        await audit.AppendAsync(actor, AccessAuditKinds.UserCreated, new { userName = name, displayName = user.DisplayName, roles, teams }, cancellationToken);
        var created = await users.CreateAsync(user, password);
        if (!created.Succeeded)
        {
            return Errors(created);
        }
        await ApplyRolesAndTeamsAsync(users, user, roles, teams);
        return UserAdminResult.Ok;
    }

    /// <summary>Creates the first administrator through /setup, then closes setup for good.</summary>
    public async Task<UserAdminResult> CreateFirstAdministratorAsync(string secret, string userName, string displayName, string password, CancellationToken cancellationToken = default)
    {
        if (!setup.Matches(secret))
        {
            await TryAuditAsync(AccessAudit.Anonymous, AccessAuditKinds.SignInFailed, new { userName, reason = "wrong setup secret" }, cancellationToken);
            return UserAdminResult.Refused(setup.IsOpen ? "the setup secret is wrong" : "setup is closed");
        }
        if (await users.Users.AnyAsync(cancellationToken))
        {
            setup.Close();
            return UserAdminResult.Refused("setup is closed");
        }
        var result = await CreateAsync(AccessAudit.Anonymous, userName, displayName, password, [Roles.Administrator], [], cancellationToken);
        if (result.Succeeded)
        {
            setup.Close();
            await audit.AppendAsync(userName.Trim(), AccessAuditKinds.SetupAdministrator, new { userName = userName.Trim() }, cancellationToken);
        }
        return result;
    }

    public async Task<UserAdminResult> SetRolesAsync(string actor, string userId, IReadOnlyCollection<string> roles, IReadOnlyCollection<string> teams, CancellationToken cancellationToken = default)
    {
        var user = await users.FindByIdAsync(userId);
        if (user is null)
        {
            return UserAdminResult.Refused("no such user");
        }
        var problems = CheckRolesAndTeams(roles, teams);
        if (problems.Count > 0)
        {
            return UserAdminResult.Refused(problems);
        }
        await audit.AppendAsync(actor, AccessAuditKinds.RolesSet, new { userName = user.UserName, roles, teams }, cancellationToken);
        await ApplyRolesAndTeamsAsync(users, user, roles, teams);
        return UserAdminResult.Ok;
    }

    public async Task<UserAdminResult> SetDisabledAsync(string actor, string userId, bool disabled, CancellationToken cancellationToken = default)
    {
        var user = await users.FindByIdAsync(userId);
        if (user is null)
        {
            return UserAdminResult.Refused("no such user");
        }
        if (disabled && string.Equals(user.UserName, actor, StringComparison.Ordinal))
        {
            return UserAdminResult.Refused("you cannot disable your own account");
        }
        await audit.AppendAsync(actor, disabled ? AccessAuditKinds.UserDisabled : AccessAuditKinds.UserEnabled, new { userName = user.UserName }, cancellationToken);
        user.Disabled = disabled;
        var updated = await users.UpdateAsync(user);
        if (!updated.Succeeded)
        {
            return Errors(updated);
        }
        await users.UpdateSecurityStampAsync(user);
        return UserAdminResult.Ok;
    }

    /// <summary>Sets a new password and clears any lockout.</summary>
    public async Task<UserAdminResult> ResetPasswordAsync(string actor, string userId, string password, CancellationToken cancellationToken = default)
    {
        var user = await users.FindByIdAsync(userId);
        if (user is null)
        {
            return UserAdminResult.Refused("no such user");
        }
        var problems = await PasswordProblemsAsync(user, password);
        if (problems.Count > 0)
        {
            return UserAdminResult.Refused(problems.Select(m => (UserAdminFields.Password, m)).ToList());
        }
        await audit.AppendAsync(actor, AccessAuditKinds.PasswordReset, new { userName = user.UserName }, cancellationToken);
        var token = await users.GeneratePasswordResetTokenAsync(user);
        var reset = await users.ResetPasswordAsync(user, token, password);
        if (!reset.Succeeded)
        {
            return Errors(reset);
        }
        await users.SetLockoutEndDateAsync(user, null);
        await users.ResetAccessFailedCountAsync(user);
        return UserAdminResult.Ok;
    }

    /// <summary>Makes the user hold exactly <paramref name="roles"/> and <paramref name="teams"/>, and renews the security stamp.</summary>
    internal static async Task ApplyRolesAndTeamsAsync(UserManager<OpsLvpUser> users, OpsLvpUser user, IEnumerable<string> roles, IEnumerable<string> teams)
    {
        var wantedRoles = roles.ToHashSet(StringComparer.Ordinal);
        var heldRoles = await users.GetRolesAsync(user);
        var removeRoles = heldRoles.Where(r => !wantedRoles.Contains(r)).ToList();
        if (removeRoles.Count > 0)
        {
            Check(await users.RemoveFromRolesAsync(user, removeRoles));
        }
        var addRoles = wantedRoles.Where(r => !heldRoles.Contains(r)).ToList();
        if (addRoles.Count > 0)
        {
            Check(await users.AddToRolesAsync(user, addRoles));
        }
        var wantedTeams = teams.ToHashSet(StringComparer.Ordinal);
        var heldTeams = (await users.GetClaimsAsync(user)).Where(c => c.Type == CommandCaller.TeamClaimType).ToList();
        var removeTeams = heldTeams.Where(c => !wantedTeams.Contains(c.Value)).ToList();
        if (removeTeams.Count > 0)
        {
            Check(await users.RemoveClaimsAsync(user, removeTeams));
        }
        var addTeams = wantedTeams.Where(t => heldTeams.All(c => c.Value != t)).Select(t => new Claim(CommandCaller.TeamClaimType, t)).ToList();
        if (addTeams.Count > 0)
        {
            Check(await users.AddClaimsAsync(user, addTeams));
        }
        Check(await users.UpdateSecurityStampAsync(user));
    }

    /// <summary>
    /// Roles must be known; teams must be teams of the running profile (an unknown team would leave its member with no
    /// items to see), held by ground staff only, and ground staff need at least one.
    /// </summary>
    private List<(string Field, string Message)> CheckRolesAndTeams(IReadOnlyCollection<string> roles, IReadOnlyCollection<string> teams)
    {
        var problems = new List<(string Field, string Message)>();
        if (roles.Count == 0)
        {
            problems.Add((UserAdminFields.Roles, "choose at least one role"));
        }
        problems.AddRange(roles.Where(r => !AccessStartup.AllRoles.Contains(r)).Select(r => (UserAdminFields.Roles, $"unknown role '{r}'")));
        var known = profileTeams.Teams;
        if (teams.Count > 0 && known is null)
        {
            problems.Add((UserAdminFields.Teams, "teams cannot be checked: no aerodrome profile is loaded"));
        }
        else if (known is not null)
        {
            var names = string.Join(", ", known.Select(t => $"{t.Name} ({t.Id})"));
            problems.AddRange(teams.Where(t => !known.Any(k => k.Id == t))
                .Select(t => (UserAdminFields.Teams, $"team '{t}' is not a team of the aerodrome profile (its teams: {names})")));
        }
        if (roles.Contains(Roles.GroundStaff) && teams.Count == 0)
        {
            problems.Add((UserAdminFields.Teams, "ground staff must belong to at least one team"));
        }
        if (!roles.Contains(Roles.GroundStaff) && teams.Count > 0)
        {
            problems.Add((UserAdminFields.Teams, "teams are only for ground staff"));
        }
        return problems;
    }

    private async Task<List<string>> PasswordProblemsAsync(OpsLvpUser user, string password)
    {
        var problems = new List<string>();
        foreach (var validator in users.PasswordValidators)
        {
            var result = await validator.ValidateAsync(users, user, password ?? "");
            problems.AddRange(result.Errors.Select(e => e.Description));
        }
        return problems;
    }

    private async Task<UserSummary> SummaryAsync(OpsLvpUser user)
    {
        var roles = await users.GetRolesAsync(user);
        var teams = (await users.GetClaimsAsync(user)).Where(c => c.Type == CommandCaller.TeamClaimType).Select(c => c.Value).Order(StringComparer.Ordinal).ToList();
        // Identity decides lockout on its own clock; asking it keeps the system clock out of product code.
        var lockedUntil = await users.IsLockedOutAsync(user) ? user.LockoutEnd : null;
        return new UserSummary(user.Id, user.UserName ?? "", user.DisplayName, roles.Order(StringComparer.Ordinal).ToList(), teams, user.Disabled, user.IsDemo, lockedUntil);
    }

    private async Task TryAuditAsync(string actor, string kind, object payload, CancellationToken cancellationToken)
    {
        try
        {
            await audit.AppendAsync(actor, kind, payload, cancellationToken);
        }
        catch (AuditCommitException)
        {
            // A refused attempt is refused either way; the failure to record it is visible in the audit health.
        }
    }

    private static UserAdminResult Errors(IdentityResult result) => new(false, result.Errors.Select(e => e.Description).ToList());

    private static void Check(IdentityResult result)
    {
        if (!result.Succeeded)
        {
            throw new InvalidOperationException(string.Join("; ", result.Errors.Select(e => e.Description)));
        }
    }

    [GeneratedRegex(@"^[A-Za-z0-9._-]{2,64}$")]
    private static partial Regex UserNamePattern();
}
