using System.Text.Json;
using Microsoft.Data.Sqlite;
using OpsLvp.Cli;

namespace OpsLvp.FaultCases;

/// <summary>What the tamper checks do to and with a stopped server's files, shared by the Web tests and the fault runner.</summary>
public static class TamperFiles
{
    /// <summary>Runs SQL on the file, as someone with write access to it would; returns the first column of the last statement's first row.</summary>
    public static async Task<object?> SqlAsync(string database, string sql)
    {
        await using var connection = new SqliteConnection($"Data Source={database};Pooling=False");
        await connection.OpenAsync();
        await using var command = connection.CreateCommand();
        command.CommandText = sql;
        return await command.ExecuteScalarAsync();
    }

    /// <summary><c>opslvp audit verify --db … --anchors … --public-key …</c> (the anchors and key optional), in this process.</summary>
    public static (int Code, JsonElement Output, string Stderr) Verify(string database, string? anchorLog, string? publicKey)
    {
        var args = new List<string> { "audit", "verify", "--db", database };
        if (anchorLog is not null)
        {
            args.AddRange(["--anchors", anchorLog]);
            if (publicKey is not null)
            {
                args.AddRange(["--public-key", publicKey]);
            }
        }
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = CliApp.Run([.. args], stdout, stderr);
        var text = stdout.ToString();
        return (code, text.Length == 0 ? default : JsonDocument.Parse(text).RootElement.Clone(), stderr.ToString());
    }

    /// <summary>Null when <c>audit verify</c>'s answer after <paramref name="tamper"/> is the one it must give, else what is wrong.</summary>
    public static string? JudgeVerify(TamperCase tamper, int code, JsonElement verified, string stderr)
    {
        ArgumentNullException.ThrowIfNull(tamper);
        if (verified.ValueKind != JsonValueKind.Object)
        {
            return $"exit {code}, no JSON: {stderr}";
        }
        var kinds = verified.GetProperty("anomalies").EnumerateArray().Select(a => a.GetProperty("kind").GetString()).ToList();
        if (tamper.Anomaly is null)
        {
            return code == 0 && kinds.Count == 0 && verified.GetProperty("ok").GetBoolean()
                && verified.GetProperty("time_regression_sequence").ValueKind == JsonValueKind.Null
                ? null
                : $"expected exit 0 and no anomaly: exit {code}: {verified}";
        }
        // the chain alone verifies: only the anchors, seal or digests show it
        return code == 4 && verified.GetProperty("ok").GetBoolean() && kinds.Contains(tamper.Anomaly)
            ? null
            : $"expected exit 4 naming {tamper.Anomaly}: exit {code}: {verified}";
    }

    /// <summary>Null when the <c>/health</c> of the next start is what it must be after <paramref name="tamper"/>, else what is wrong.</summary>
    public static string? JudgeStart(TamperCase tamper, JsonElement health)
    {
        ArgumentNullException.ThrowIfNull(tamper);
        var status = health.GetProperty("status").GetString();
        if (tamper.StopText is null)
        {
            return status == "ok" ? null : $"expected ok: {health}";
        }
        var stopped = health.GetProperty("engine").TryGetProperty("stopped", out var s) && s.ValueKind == JsonValueKind.String ? s.GetString()! : "";
        return status == "failing" && stopped.Contains(tamper.StopText, StringComparison.Ordinal) && stopped.Contains("Engine:AcknowledgeStateMismatch=", StringComparison.Ordinal)
            ? null
            : $"expected failing with the engine stopped naming \"{tamper.StopText}\" and the acknowledgement setting: {health}";
    }
}
