using MudBlazor.Services;
using OpsLvp.Web.Access;
using OpsLvp.Web.Components;
using OpsLvp.Web.Components.Shell;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Live;
using OpsLvp.Web.Review;
using OpsLvp.Web.Time;

if (HealthCheckMode.Requested(args))
{
    return await HealthCheckMode.RunAsync(args);
}

var builder = WebApplication.CreateBuilder(args);

// SQL statements at Warning in every environment, whatever appsettings a folder happens to provide: a night's log
// tells the night, not the queries (a more specific Logging:LogLevel category can still ask for them).
builder.Logging.AddFilter("Microsoft.EntityFrameworkCore", LogLevel.Warning);

builder.Services.AddRazorComponents().AddInteractiveServerComponents();
builder.Services.AddMudServices();
builder.Services.AddAppPaths(builder.Configuration, builder.Environment);
builder.Services.AddAppClock(builder.Configuration);
builder.Services.AddFeeds(builder.Configuration);
builder.Services.AddLiveEngine(builder.Configuration);
builder.Services.AddReview();
builder.Services.AddAccess(builder.Configuration);
builder.Services.AddScreens(builder.Configuration);

var app = builder.Build();

if (!app.Environment.IsDevelopment())
{
    app.UseExceptionHandler("/Error", createScopeForErrors: true);
}

app.UseStatusCodePagesWithReExecute("/not-found", createScopeForStatusCodePages: true);
app.UseAppAssets();
app.UseAccess();
app.UseAntiforgery();

app.MapStaticAssets();
app.MapHealthApi();
app.MapReadingsApi();
app.MapLiveApi();
app.MapReviewApi().RequireAuthorization(AccessPolicies.Review);
app.MapAccessEndpoints();
app.MapRazorComponents<App>().AddInteractiveServerRenderMode();

await app.RunAsync();
return 0;
