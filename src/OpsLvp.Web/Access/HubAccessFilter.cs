using Microsoft.AspNetCore.Authorization;
using Microsoft.AspNetCore.SignalR;

namespace OpsLvp.Web.Access;

/// <summary>
/// Applied to the app's hub (<see cref="OpsLvp.Web.Live.LvpHub"/>, not Blazor's circuit hub): a connection must satisfy <see cref="AccessPolicies.HubRead"/> (whatever attributes the
/// hub class has), is watched by <see cref="HubConnectionMonitor"/>, and each client-to-server call must satisfy the
/// policy <see cref="HubMethodPolicies"/> gives that method; a method missing from the table is refused.
/// </summary>
public sealed class HubAccessFilter(IAuthorizationService authorization, HubConnectionMonitor monitor) : IHubFilter
{
    public async Task OnConnectedAsync(HubLifetimeContext context, Func<HubLifetimeContext, Task> next)
    {
        var user = context.Context.User;
        if (user is null || !(await authorization.AuthorizeAsync(user, AccessPolicies.HubRead)).Succeeded)
        {
            throw new HubException("not authorised: sign in, use a display link, or an API key with the hub-read scope");
        }
        monitor.Add(context.Context);
        await next(context);
    }

    public async Task OnDisconnectedAsync(HubLifetimeContext context, Exception? exception, Func<HubLifetimeContext, Exception?, Task> next)
    {
        monitor.Remove(context.Context);
        await next(context, exception);
    }

    public async ValueTask<object?> InvokeMethodAsync(HubInvocationContext invocationContext, Func<HubInvocationContext, ValueTask<object?>> next)
    {
        var method = invocationContext.HubMethodName;
        if (!HubMethodPolicies.Table.TryGetValue(method, out var policy))
        {
            throw new HubException($"hub method '{method}' has no access policy");
        }
        var user = invocationContext.Context.User;
        if (user is null || !(await authorization.AuthorizeAsync(user, policy)).Succeeded)
        {
            throw new HubException($"not authorised to call '{method}'");
        }
        return await next(invocationContext);
    }
}
