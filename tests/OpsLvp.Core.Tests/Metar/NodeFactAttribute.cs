namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// A fact that needs Node.js. Without node on PATH it is skipped with a message, unless CI=true or
/// OPSLVP_REQUIRE_BROWSER=1 is set: then it runs and fails, saying node is missing.
/// </summary>
[AttributeUsage(AttributeTargets.Method, AllowMultiple = false)]
public sealed class NodeFactAttribute : FactAttribute
{
    public NodeFactAttribute()
    {
        if (!NodeTool.IsAvailable && !NodeTool.IsRequired)
        {
            Skip = "Node.js (node and npm) not found on PATH: the npm cross-check is skipped. "
                + "Set CI=true or OPSLVP_REQUIRE_BROWSER=1 to make this a failure.";
        }
    }
}
