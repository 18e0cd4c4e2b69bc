namespace OpsLvp.Core.Tests.Forecast;

/// <summary>
/// The invented TAF corpus (taf-corpus.txt, copied to the test output). Format: "#" comment and blank lines are
/// skipped; a leading "!" marks text the decoder must refuse.
/// </summary>
internal static class TafCorpus
{
    public static string FilePath => Path.Combine(AppContext.BaseDirectory, "Forecast", "taf-corpus.txt");

    public static IReadOnlyList<TafCorpusEntry> Load()
    {
        var lines = File.ReadAllLines(FilePath);
        var entries = new List<TafCorpusEntry>();
        for (var i = 0; i < lines.Length; i++)
        {
            var raw = lines[i];
            if (raw.Trim().Length == 0 || raw.StartsWith('#'))
            {
                continue;
            }
            var refuse = raw[0] == '!';
            entries.Add(new TafCorpusEntry(i + 1, refuse ? raw[1..] : raw, refuse));
        }
        return entries;
    }
}

/// <summary>One corpus forecast with its 1-based line number and whether the decoder must refuse it.</summary>
internal sealed record TafCorpusEntry(int Line, string Text, bool MustRefuse);
