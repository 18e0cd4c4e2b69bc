using BenchmarkDotNet.Columns;
using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Diagnosers;
using BenchmarkDotNet.Exporters;
using BenchmarkDotNet.Jobs;
using BenchmarkDotNet.Loggers;
using BenchmarkDotNet.Toolchains.InProcess.Emit;
using Perfolizer.Horology;

namespace OpsLvp.Benchmarks;

/// <summary>
/// BenchmarkDotNet configuration. Benchmarks run in process (no generated project to build, which keeps the quick
/// run short on a shared 2-core machine); ratios compare cases of the same process and run.
/// </summary>
public static class BenchConfig
{
    public static IConfig Create(BenchOptions options, int warmups = 1, int iterations = 3)
    {
        var job = options.Quick
            ? Job.Default.WithId("quick").WithWarmupCount(warmups).WithIterationCount(iterations).WithIterationTime(TimeInterval.FromMilliseconds(100))
            : Job.Default.WithId("full").WithWarmupCount(3).WithIterationCount(15).WithIterationTime(TimeInterval.FromMilliseconds(250));
        return ManualConfig.CreateEmpty()
            .AddJob(job.WithToolchain(InProcessEmitToolchain.Instance))
            .AddColumnProvider(DefaultColumnProviders.Instance)
            .AddDiagnoser(MemoryDiagnoser.Default)
            .AddLogger(ConsoleLogger.Default)
            .AddExporter(MarkdownExporter.GitHub)
            .WithArtifactsPath(options.OutFolder)
            .WithOptions(ConfigOptions.DisableLogFile);
    }
}
