using MudBlazor.Services;
using OpsLvp.Web.Access;
using OpsLvp.Web.Anchors;
using OpsLvp.Web.Cluster;
using OpsLvp.Web.Components;
using OpsLvp.Web.Components.Shell;
using OpsLvp.Web.Engine;
using OpsLvp.Web.Feeds;
using OpsLvp.Web.Hosting;
using OpsLvp.Web.Live;
using OpsLvp.Web.Retention;
using OpsLvp.Web.Review;
using OpsLvp.Web.Time;

if (HealthCheckMode.Requested(args))
{
    return await HealthCheckMode.RunAsync(args);
}

// Settings, web root, profile and assets from the application's folder when started from another working folder
// (docs/deployment.md "Folders"); anything missing stops the start with a message naming it.
var builder = WebApplication.CreateBuilder(StartupPaths.Options(args, Directory.GetCurrentDirectory(), AppContext.BaseDirectory, Environment.GetEnvironmentVariable));
StartupPaths.UseBuildAssetsWhenNotPublished(builder);
if (StartupPaths.Missing(builder.Environment) is { } missing)
{
    await Console.Error.WriteLineAsync(missing);
    return 2;
}

// SQL statements at Warning in every environment, whatever appsettings a folder happens to provide: a night's log
// tells the night, not the queries (a more specific Logging:LogLevel category can still ask for them).
builder.Logging.AddFilter("Microsoft.EntityFrameworkCore", LogLevel.Warning);

builder.Services.AddRazorComponents().AddInteractiveServerComponents();
builder.Services.AddMudServices();
builder.Services.AddAppPaths(builder.Configuration, builder.Environment);
builder.Services.AddTrustedProxies(builder.Configuration);
builder.Services.AddAppClock(builder.Configuration);
builder.Services.AddFeeds(builder.Configuration);
// before the engine: the anchor service stops after it, so the shutdown anchor covers its last entries
builder.Services.AddAnchors(builder.Configuration);
builder.Services.AddLiveEngine(builder.Configuration);
builder.Services.AddReadingsRetention(builder.Configuration);
// with Cluster:Redis: hub backplane, snapshot fan-out, command forwarding (docs/deployment.md)
builder.Services.AddCluster(builder.Configuration);
builder.Services.AddReview();
builder.Services.AddAccess(builder.Configuration);
builder.Services.AddScreens(builder.Configuration);

var app = builder.Build();

// Before any hosted service opens the database (data protection loads its key ring from it at start, and every
// read-write connection switches the journal to WAL), so the journal-mode check sees the file as it was left and
// the engine host can put a switch on record (docs/reliability.md "Storage faults"). A failure here is reported by
// the start-up services, which migrate through the same call again.
try
{
    await OpsLvp.Data.DatabaseStartup.MigrateAndCheckAsync(
        app.Services.GetRequiredService<Microsoft.EntityFrameworkCore.IDbContextFactory<OpsLvp.Data.OpsLvpDbContext>>());
}
catch (Exception ex)
{
    app.Logger.LogWarning(ex, "Database check before start failed; the start-up services will retry and report it");
}

// Before everything that reads the client's address or scheme (docs/deployment.md "Behind a reverse proxy").
app.UseTrustedProxies();
// First, so static assets, error pages and re-executed status pages carry the headers too (docs/access.md).
app.UseSecurityHeaders();
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
app.MapForecastsApi();
app.MapFacilitiesApi();
app.MapLiveApi();
app.MapAnchorApi();
app.MapReviewApi().RequireAuthorization(AccessPolicies.Review);
app.MapAccessEndpoints();
app.MapRazorComponents<App>().AddInteractiveServerRenderMode();

await app.RunAsync();
return 0;
