namespace OpsLvp.Web.Access;

/// <summary><c>Cache-Control: no-store</c> on endpoints whose answer is live or operational data (docs/access.md).</summary>
public static class NoStore
{
    public const string HeaderValue = "no-store";

    /// <summary>Marks every response of the endpoint(s) <c>no-store</c>, errors included.</summary>
    public static TBuilder WithNoStore<TBuilder>(this TBuilder builder)
        where TBuilder : IEndpointConventionBuilder
    {
        ArgumentNullException.ThrowIfNull(builder);
        builder.AddEndpointFilter(static (context, next) =>
        {
            context.HttpContext.Response.Headers.CacheControl = HeaderValue;
            return next(context);
        });
        return builder;
    }
}
