using System.Collections.Concurrent;
using Microsoft.Extensions.Logging;

namespace OpsLvp.Web.Tests.Infrastructure;

/// <summary>Keeps every log line written through it (category, level, formatted message), for tests that read the server's log.</summary>
public sealed class CapturingLoggerProvider : ILoggerProvider
{
    private readonly ConcurrentQueue<(string Category, LogLevel Level, string Message)> _lines = new();

    public IReadOnlyList<(string Category, LogLevel Level, string Message)> Lines => [.. _lines];

    public ILogger CreateLogger(string categoryName) => new Capture(categoryName, _lines);

    public void Dispose()
    {
    }

    private sealed class Capture(string category, ConcurrentQueue<(string, LogLevel, string)> lines) : ILogger
    {
        public IDisposable? BeginScope<TState>(TState state)
            where TState : notnull => null;

        public bool IsEnabled(LogLevel logLevel) => logLevel != LogLevel.None;

        public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter) =>
            lines.Enqueue((category, logLevel, formatter(state, exception)));
    }
}
