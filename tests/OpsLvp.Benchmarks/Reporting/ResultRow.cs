namespace OpsLvp.Benchmarks.Reporting;

/// <summary>One figure: its value, its ratio against <paramref name="Against"/> (measured in the same run), allocation, target verdict and the command that produced it.</summary>
public sealed record ResultRow(string Section, string Figure, string Value, double? Ratio, string? Against, string? Allocated, string? Target, string Command);
