namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>A test through a throwaway nginx (<see cref="NginxProcess"/>): skipped, saying why, when nginx is missing, unless OPSLVP_REQUIRE_SERVICES=1.</summary>
public sealed class NginxFactAttribute : FactAttribute
{
    public NginxFactAttribute()
    {
        Skip = NginxProcess.SkipReason;
    }
}
