using Bunit;
using Bunit.Rendering;
using MudBlazor;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Components.Pages.Console;
using OpsLvp.Web.Tests.Components.Testing;

namespace OpsLvp.Web.Tests.Components.Console;

/// <summary>The console shows the deterioration-forecast flag once, in the shared forecast line (docs/screens.md). Values are invented.</summary>
public sealed class ConsoleForecastOnceTests : LiveComponentTest
{
    private IRenderedComponent<ContainerFragment> RenderConsole() => Render(b =>
    {
        b.OpenComponent<MudPopoverProvider>(0);
        b.CloseComponent();
        b.OpenComponent<MudDialogProvider>(1);
        b.CloseComponent();
        b.OpenComponent<DutyConsole>(2);
        b.CloseComponent();
    });

    [Theory]
    [InlineData(true, "FORECAST ON")]
    [InlineData(false, "FORECAST OFF")]
    public void ForecastFlag_AppearsOnce_InTheForecastLine(bool on, string headline)
    {
        SignIn("dana (invented)", Roles.DutyManager);
        Live.Set(TestSnapshots.Make(1, forecast: on));
        var cut = RenderConsole();

        var line = Assert.Single(cut.FindAll("[data-testid=forecast-line]"));
        Assert.Equal(on ? "true" : "false", line.GetAttribute("data-on"));
        Assert.Equal(headline, Assert.Single(cut.FindAll("[data-testid=forecast-headline]")).TextContent.Trim());
        // no second place says the flag: no "Deterioration forecast" fact row in the condition card
        Assert.Empty(cut.FindAll("[data-testid=console-forecast]"));
        Assert.DoesNotContain(cut.FindAll("[data-testid=console-condition] dt"), dt => dt.TextContent.Contains("forecast", StringComparison.OrdinalIgnoreCase));
    }
}
