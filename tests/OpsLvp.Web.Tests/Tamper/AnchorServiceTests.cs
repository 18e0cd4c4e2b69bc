using System.Net;
using System.Security.Cryptography;
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

    private const string AnchorPath = AnchorServiceCollectionExtensions.AnchorPath;
}
