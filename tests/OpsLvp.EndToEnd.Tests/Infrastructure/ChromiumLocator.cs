namespace OpsLvp.EndToEnd.Tests.Infrastructure;

/// <summary>
/// Finds the machine's Chromium: <c>OPSLVP_CHROMIUM</c> when set, else <c>/usr/bin/chromium</c>. With
/// <c>OPSLVP_REQUIRE_BROWSER=1</c> (CI) a missing browser fails the tests instead of skipping them (DEVELOPERS.md "Tests").
/// </summary>
public static class ChromiumLocator
{
    public const string PathVariable = "OPSLVP_CHROMIUM";

    public const string RequireVariable = "OPSLVP_REQUIRE_BROWSER";

    public const string DefaultPath = "/usr/bin/chromium";

    /// <summary>Where the browser is looked for.</summary>
    public static string CandidatePath =>
        Environment.GetEnvironmentVariable(PathVariable) is { Length: > 0 } configured ? configured : DefaultPath;

    /// <summary>The executable, or null when there is none at <see cref="CandidatePath"/>.</summary>
    public static string? Find() => File.Exists(CandidatePath) ? CandidatePath : null;

    public static bool Required => Environment.GetEnvironmentVariable(RequireVariable) == "1";

    /// <summary>Why tests are skipped, or null when they run (browser present, or required so they fail loudly).</summary>
    public static string? SkipReason =>
        Find() is null && !Required
            ? $"no Chromium at {CandidatePath} (set {PathVariable}, or {RequireVariable}=1 to fail instead of skipping)"
            : null;

    /// <summary>The executable, or a failure that says what was looked for and how to fix it.</summary>
    public static string Require() =>
        Find() ?? throw new InvalidOperationException(
            $"{RequireVariable}=1 but no Chromium was found at {CandidatePath}: install it (apt-get install chromium) or set {PathVariable} to its path.");
}
