using Microsoft.AspNetCore.Authorization;
using Microsoft.AspNetCore.SignalR;
using OpsLvp.Web.Live;

namespace OpsLvp.Web.Access;

/// <summary>
/// Registered for every hub but acting only on the app's hub (<see cref="LvpHub"/>): Blazor's circuit hub has its own
/// access (the circuit's principal, revalidated) and must keep its framework methods (StartCircuit, ...). A connection must satisfy <see cref="AccessPolicies.HubRead"/> (whatever attributes the
/// hub class has), is watched by <see cref="HubConnectionMonitor"/>, and each client-to-server call must satisfy the
/// policy <see cref="HubMethodPolicies"/> gives that method; a method missing from the table is refused.
/// </summary>
public sealed class HubAccessFilter(IAuthorizationService authorization, HubConnectionMonitor monitor) : IHubFilter
{
    public async Task OnConnectedAsync(HubLifetimeContext context, Func<HubLifetimeContext, Task> next)
    {
        if (context.Hub is not LvpHub)
        {
            await next(context);
            return;
        }
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
        if (context.Hub is LvpHub)
        {
            monitor.Remove(context.Context);
        }
        await next(context, exception);
    }

    public async ValueTask<object?> InvokeMethodAsync(HubInvocationContext invocationContext, Func<HubInvocationContext, ValueTask<object?>> next)
    {
        if (invocationContext.Hub is not LvpHub)
        {
            return await next(invocationContext);
        }
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
