namespace OpsLvp.Core.Engine.Replay;

/// <summary>One data row of a replay CSV file: its fields and an error maker naming the file and line.</summary>
internal readonly record struct CsvRow(string FileName, int Line, IReadOnlyList<string> Fields)
{
    public FormatException Error(string what) => new($"{FileName} line {Line}: {what}");

    /// <summary>The time in field <paramref name="index"/>: ISO 8601 with Z or an offset.</summary>
    public DateTimeOffset TimeAt(int index) =>
        Csv.TryTime(Fields[index], out var time) ? time : throw Error($"bad time '{Fields[index]}' (ISO 8601 with Z or an offset)");
}
