using System.Security.Cryptography;
using System.Text.Json;
using OpsLvp.Cli;
using OpsLvp.Data.Stores;

namespace OpsLvp.Web.Tests.Persistence;

public class AuditVerifyCliTests
{
    // Invented entries.
    private static readonly DateTimeOffset _t0 = new(2026, 1, 2, 3, 0, 0, TimeSpan.Zero);

    [Fact]
    public async Task GoodFile_PrintsOkWithTheCount_AndExitsZero_WithoutChangingTheFile()
    {
        using var temp = await FileWithEntriesAsync(4);
        var before = Digest(temp.FilePath);

        var (code, stdout, stderr) = Run("audit", "verify", "--db", temp.FilePath);

        Assert.Equal(0, code);
        Assert.Equal("", stderr);
        using var json = JsonDocument.Parse(stdout);
        Assert.Equal(4, json.RootElement.GetProperty("entries").GetInt64());
        Assert.True(json.RootElement.GetProperty("ok").GetBoolean());
        Assert.Equal(JsonValueKind.Null, json.RootElement.GetProperty("first_bad_sequence").ValueKind);
        Assert.Equal(before, Digest(temp.FilePath));
    }

    [Fact]
    public async Task TamperedFile_NamesTheFirstBadSequence_AndExitsThree()
    {
        using var temp = await FileWithEntriesAsync(4);
        await temp.ExecuteRawAsync("DROP TRIGGER audit_entries_no_update; UPDATE audit_entries SET actor = 'someone.else' WHERE sequence = 2;");

        var (code, stdout, _) = Run("audit", "verify", "--db", temp.FilePath);

        Assert.Equal(3, code);
        using var json = JsonDocument.Parse(stdout);
        Assert.False(json.RootElement.GetProperty("ok").GetBoolean());
        Assert.Equal(2, json.RootElement.GetProperty("first_bad_sequence").GetInt64());
        Assert.Equal("hash_mismatch", json.RootElement.GetProperty("reason").GetString());
        Assert.Equal(4, json.RootElement.GetProperty("entries").GetInt64());
    }

    [Fact]
    public async Task EmptyChain_IsOkWithZeroEntries()
    {
        using var temp = await TempDatabase.CreateMigratedAsync();

        var (code, stdout, _) = Run("audit", "verify", "--db", temp.FilePath);

        Assert.Equal(0, code);
        Assert.Equal(0, JsonDocument.Parse(stdout).RootElement.GetProperty("entries").GetInt64());
    }

    [Fact]
    public void MissingFile_OneLineErrorAndExitOne_AndNoFileCreated()
    {
        using var temp = TempDatabase.CreateEmpty();

        var (code, stdout, stderr) = Run("audit", "verify", "--db", temp.FilePath);

        Assert.Equal(1, code);
        Assert.Equal("", stdout);
        Assert.Single(stderr.TrimEnd().Split('\n'));
        Assert.Contains("not found", stderr, StringComparison.Ordinal);
        Assert.False(File.Exists(temp.FilePath));
    }

    [Fact]
    public void FileThatIsNotADatabase_OneLineErrorAndExitOne()
    {
        using var temp = TempDatabase.CreateEmpty();
        File.WriteAllText(temp.FilePath, "time,sensor,value\nthis is a CSV file, not a database\n");

        var (code, stdout, stderr) = Run("audit", "verify", "--db", temp.FilePath);

        Assert.Equal(1, code);
        Assert.Equal("", stdout);
        Assert.Single(stderr.TrimEnd().Split('\n'));
        Assert.StartsWith("error: ", stderr, StringComparison.Ordinal);
    }

    [Fact]
    public async Task SqliteFileWithoutAuditTable_OneLineErrorAndExitOne()
    {
        using var temp = TempDatabase.CreateEmpty();
        await temp.ExecuteRawAsync("CREATE TABLE other (x INTEGER);");

        var (code, _, stderr) = Run("audit", "verify", "--db", temp.FilePath);

        Assert.Equal(1, code);
        Assert.Contains("no audit_entries table", stderr, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("audit", "verify")]
    [InlineData("audit", "verify", "--db")]
    [InlineData("audit", "verify", "--db", "a.db", "--extra")]
    public void BadCommandLine_ExitsTwo(params string[] args)
    {
        var (code, stdout, stderr) = Run(args);

        Assert.Equal(2, code);
        Assert.Equal("", stdout);
        Assert.StartsWith("error: ", stderr, StringComparison.Ordinal);
    }

    private static async Task<TempDatabase> FileWithEntriesAsync(int count)
    {
        var temp = await TempDatabase.CreateMigratedAsync();
        using var store = new AuditStore(temp.Factory);
        await store.AppendAsync(Enumerable.Range(1, count)
            .Select(i => new NewAuditEntry("dm.invented", "transition", $"{{\"n\":{i}}}", _t0.AddSeconds(i)))
            .ToList());
        return temp;
    }

    private static (int Code, string Stdout, string Stderr) Run(params string[] args)
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run(args, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    private static string Digest(string path) => Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(path)));
}
