using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Identity;
using Microsoft.Extensions.Options;
using OpsLvp.Data.Entities;

namespace OpsLvp.Web.Access;

/// <summary>Identity's sign-in manager, refusing disabled accounts.</summary>
public sealed class OpsLvpSignInManager(
    UserManager<OpsLvpUser> userManager,
    IHttpContextAccessor contextAccessor,
    IUserClaimsPrincipalFactory<OpsLvpUser> claimsFactory,
    IOptions<IdentityOptions> optionsAccessor,
    ILogger<SignInManager<OpsLvpUser>> logger,
    IAuthenticationSchemeProvider schemes,
    IUserConfirmation<OpsLvpUser> confirmation)
    : SignInManager<OpsLvpUser>(userManager, contextAccessor, claimsFactory, optionsAccessor, logger, schemes, confirmation)
{
    public override async Task<bool> CanSignInAsync(OpsLvpUser user)
    {
        ArgumentNullException.ThrowIfNull(user);
        return !user.Disabled && await base.CanSignInAsync(user);
    }
}
