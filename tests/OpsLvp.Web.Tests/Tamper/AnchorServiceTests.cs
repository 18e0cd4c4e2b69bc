using System.Net;
using System.Security.Cryptography;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using OpsLvp.Core.Audit.Anchors;
using OpsLvp.Web.Anchors;
using OpsLvp.Web.Commands;
using OpsLvp.Web.Tests.Access;
using OpsLvp.Web.Tests.Infrastructure;

namespace OpsLvp.Web.Tests.Tamper;

/// <summary>
/// The anchor service on a real server (docs/audit.md "Anchors"): the key generated at first start beside (not
/// inside) the data folder, a signed head on the interval and at shutdown, on demand for administrators only,
/// and key or log paths inside the data folder refused at start.
/// </summary>
public sealed class AnchorServiceTests
{
    [Fact]
    public async Task FirstStart_GeneratesTheKeyOutsideTheDataFolder_AndSignsTheHeadOnTheIntervalAndAtShutdown()
    {
        var folder = OpsLvpApp.NewDataFolder();
        var anchors = folder + "-anchors";
        try
        {
            int linesWhileRunning;
            await using (var app = OpsLvpApp.Start(new Dictionary<string, string?> { ["Anchors:Interval"] = "00:00:01" }, folder))
            {
                var log = Path.Combine(anchors, "anchors.jsonl");
                await Eventually.TrueAsync(() => File.Exists(log) && File.ReadAllLines(log).Length >= 2, "two interval anchors", TimeSpan.FromSeconds(60));
                linesWhileRunning = File.ReadAllLines(log).Length;
            }

            var key = Path.Combine(anchors, "anchor-key.pem");
            Assert.True(File.Exists(key));
            Assert.False(Directory.EnumerateFiles(folder, "*.pem", SearchOption.AllDirectories).Any()); // nothing of it in the data folder
            if (!OperatingSystem.IsWindows())
            {
                Assert.Equal(UnixFileMode.UserRead | UnixFileMode.UserWrite, File.GetUnixFileMode(key));
            }
            using var pem = ECDsa.Create();
            pem.ImportFromPem(await File.ReadAllTextAsync(Path.Combine(anchors, "anchor-key.pub.pem")));
            var fingerprint = AuditAnchor.Fingerprint(Convert.ToBase64String(pem.ExportSubjectPublicKeyInfo()));

            var lines = await File.ReadAllLinesAsync(Path.Combine(anchors, "anchors.jsonl"));
            Assert.True(lines.Length > linesWhileRunning, "the shutdown anchor was not written");
            var (valid, problems) = AnchorCheck.Read(lines, fingerprint);
            Assert.Empty(problems);
            Assert.Equal(lines.Length, valid.Count);
            Assert.True(valid[^1].Anchor.Sequence >= 1); // engine_started at least
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task TwoStopsAtOnce_NeitherReturnsBeforeTheShutdownAnchorIsWritten()
    {
        // The generic host stops its services twice when a test host (or anything else) stops it while its run loop
        // waits: the second stop used to return at once, and its caller disposed the host, key and logger included,
        // while the first stop was still writing the anchor (ObjectDisposedException, no shutdown anchor).
        var folder = OpsLvpApp.NewDataFolder();
        var log = Path.Combine(folder + "-anchors", "anchors.jsonl");
        try
        {
            await using var app = OpsLvpApp.Start(new Dictionary<string, string?>(), folder);
            var service = app.Services.GetServices<Microsoft.Extensions.Hosting.IHostedService>().OfType<AnchorService>().Single();
            var before = File.Exists(log) ? File.ReadAllLines(log).Length : 0;

            var first = service.StopAsync(CancellationToken.None);
            var second = service.StopAsync(CancellationToken.None);
            await Task.WhenAny(first, second);

            Assert.True(File.Exists(log) && File.ReadAllLines(log).Length == before + 1,
                "a stop returned before the shutdown anchor was written");
            await Task.WhenAll(first, second);
            Assert.Equal(before + 1, File.ReadAllLines(log).Length); // one shutdown anchor, not two
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task OnDemandAnchor_IsForAdministratorsOnly()
    {
        await using var app = AccessApp.Start();
        await app.CreateUserAsync("admin.anchor", Roles.Administrator);
        await app.CreateUserAsync("dm.anchor", Roles.DutyManager);
        var log = Path.Combine(app.DataFolder + "-anchors", "anchors.jsonl");
        int Lines() => File.Exists(log) ? File.ReadAllLines(log).Length : 0;
        var before = Lines();

        using (var anonymous = AccessClient.For(app))
        using (var refused = await anonymous.Http.PostAsync(new Uri(AnchorPath, UriKind.Relative), null))
        {
            Assert.NotEqual(HttpStatusCode.OK, refused.StatusCode);
        }
        using (var dm = AccessClient.For(app))
        {
            (await dm.SignInAsync("dm.anchor", AccessApp.Password)).Dispose();
            using var refused = await dm.Http.PostAsync(new Uri(AnchorPath, UriKind.Relative), null);
            Assert.NotEqual(HttpStatusCode.OK, refused.StatusCode);
        }
        Assert.Equal(before, Lines()); // the refused requests signed nothing

        using var admin = AccessClient.For(app);
        (await admin.SignInAsync("admin.anchor", AccessApp.Password)).Dispose();
        using var answer = await admin.Http.PostAsync(new Uri(AnchorPath, UriKind.Relative), null);

        Assert.Equal(HttpStatusCode.OK, answer.StatusCode);
        var anchor = AuditAnchor.Parse(await answer.Content.ReadAsStringAsync());
        Assert.True(anchor.SignatureValid());
        Assert.Equal(before + 1, Lines());
        Assert.Equal(anchor, AuditAnchor.Parse(File.ReadAllLines(log)[^1]));
        var head = await Live.LiveClient.Audit(app).GetHeadAsync();
        Assert.Equal((head!.Sequence, head.Hash), (anchor.Sequence, anchor.Hash));
    }

    [Theory]
    [InlineData("Anchors:KeyPath")]
    [InlineData("Anchors:LogPath")]
    public void PathInsideTheDataFolder_StopsTheStart_NamingTheSetting(string setting)
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var ex = Assert.ThrowsAny<Exception>(() => OpsLvpApp.Start(new Dictionary<string, string?> { [setting] = Path.Combine(folder, "inside", "file") }, folder));
            var validation = ex as OptionsValidationException ?? ex.InnerException as OptionsValidationException
                ?? (ex as AggregateException)?.InnerExceptions.OfType<OptionsValidationException>().FirstOrDefault();
            Assert.NotNull(validation);
            Assert.Contains($"{setting} '", validation.Message, StringComparison.Ordinal);
            Assert.Contains("is inside the data folder", validation.Message, StringComparison.Ordinal);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task EveryAnchor_IsAlsoWrittenToTheServerLog()
    {
        // the real server process: its console output is the server log (docs/deployment.md "The server log")
        var folder = OpsLvpApp.NewDataFolder();
        var anchors = folder + "-anchors";
        try
        {
            Directory.CreateDirectory(folder);
            var profile = OpsLvp.FaultCases.FaultProfile.Write(folder);
            using var server = await OpsLvp.FaultCases.ServerProcess.StartAsync(folder, profile, new Dictionary<string, string>
            {
                ["Anchors__Interval"] = "00:00:01",
                // the shipped default level (appsettings.json), which the process runner lowers to Warning
                ["Logging__LogLevel__Default"] = "Information",
            });
            var log = Path.Combine(anchors, "anchors.jsonl");
            await Eventually.TrueAsync(() => File.Exists(log) && File.ReadAllLines(log).Length >= 2, "two interval anchors", TimeSpan.FromSeconds(60));

            var written = File.ReadAllLines(log).Take(2).ToList();
            await Eventually.TrueAsync(() => written.All(line => server.LastLines.Any(l => l.Contains(line, StringComparison.Ordinal))),
                "the anchor lines in the server log", TimeSpan.FromSeconds(30));
            var logged = server.LastLines.Where(l => l.Contains("Audit anchor (interval): ", StringComparison.Ordinal)).ToList();
            Assert.NotEmpty(logged);
            Assert.Contains(logged, l => l.EndsWith(written[0], StringComparison.Ordinal));
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Theory]
    [InlineData("00:05:01")]
    [InlineData("01:00:00")]
    public void IntervalOverFiveMinutes_StopsTheStart_NamingTheSetting(string interval)
    {
        var folder = OpsLvpApp.NewDataFolder();
        try
        {
            var ex = Assert.ThrowsAny<Exception>(() => OpsLvpApp.Start(new Dictionary<string, string?> { ["Anchors:Interval"] = interval }, folder));
            var validation = ex as OptionsValidationException ?? ex.InnerException as OptionsValidationException
                ?? (ex as AggregateException)?.InnerExceptions.OfType<OptionsValidationException>().FirstOrDefault();
            Assert.NotNull(validation);
            Assert.Contains("Anchors:Interval must be between 00:00:00.001 and 00:05:00.", validation.Message, StringComparison.Ordinal);
        }
        finally
        {
            OpsLvpApp.TryDelete(folder);
        }
    }

    [Fact]
    public async Task IntervalOfFiveMinutes_Starts()
    {
        // the boundary the issue names (every ≤ 5 minutes) is allowed
        await using var app = OpsLvpApp.Start(new Dictionary<string, string?> { ["Anchors:Interval"] = "00:05:00" });
        await app.GetHealthAsync();
        Assert.Equal(TimeSpan.FromMinutes(5), app.Services.GetRequiredService<IOptions<AnchorOptions>>().Value.Interval);
    }

    private const string AnchorPath = AnchorServiceCollectionExtensions.AnchorPath;
}
