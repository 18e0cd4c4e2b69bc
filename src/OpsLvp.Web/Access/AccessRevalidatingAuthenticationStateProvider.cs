using System.Security.Claims;
using Microsoft.AspNetCore.Components.Authorization;
using Microsoft.AspNetCore.Components.Server;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Access;

/// <summary>
/// Re-checks a Blazor circuit's principal every <see cref="AccessOptions.RevalidationInterval"/>; when it is no
/// longer valid (<see cref="AccessValidator"/>) the circuit becomes anonymous, so commands are refused and
/// protected pages send it to sign-in.
/// </summary>
public sealed class AccessRevalidatingAuthenticationStateProvider(
    ILoggerFactory loggerFactory,
    AccessValidator validator,
    IOptions<AccessOptions> options)
    : RevalidatingServerAuthenticationStateProvider(loggerFactory)
{
    protected override TimeSpan RevalidationInterval => options.Value.RevalidationInterval;

    protected override Task<bool> ValidateAuthenticationStateAsync(AuthenticationState authenticationState, CancellationToken cancellationToken) =>
        validator.IsStillValidAsync(authenticationState.User ?? new ClaimsPrincipal(), cancellationToken);
}
