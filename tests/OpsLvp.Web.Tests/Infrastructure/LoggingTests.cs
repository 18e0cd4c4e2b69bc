using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>What the server writes to its log (issue 13: SQL at Warning in every environment).</summary>
public sealed class LoggingTests
{
    [Fact]
    public async Task SqlStatements_AreNotLoggedBelowWarning_EvenWhenTheSettingsAskForEntityFrameworkInformation()
    {
        await using var app = OpsLvpApp.Start(new Dictionary<string, string?>
        {
            ["Logging:LogLevel:Default"] = "Information",
            ["Logging:LogLevel:Microsoft.EntityFrameworkCore"] = "Information",
        });
        var logger = app.Services.GetRequiredService<ILoggerFactory>().CreateLogger("Microsoft.EntityFrameworkCore.Database.Command");

        Assert.False(logger.IsEnabled(LogLevel.Information));
        Assert.True(logger.IsEnabled(LogLevel.Warning));
    }
}
