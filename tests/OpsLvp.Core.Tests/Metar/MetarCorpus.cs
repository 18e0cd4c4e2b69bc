namespace OpsLvp.Core.Tests.Metar;

/// <summary>
/// The invented report corpus (corpus.txt, copied to the test output). Format: "#" comment and blank lines are
/// skipped; a leading "!" marks text the decoder must refuse, "?" text with groups it does not know.
/// </summary>
internal static class MetarCorpus
{
    public static string FilePath => Path.Combine(AppContext.BaseDirectory, "Metar", "corpus.txt");

    public static IReadOnlyList<MetarCorpusEntry> Load()
    {
        var lines = File.ReadAllLines(FilePath);
        var entries = new List<MetarCorpusEntry>();
        for (var i = 0; i < lines.Length; i++)
        {
            var raw = lines[i];
            if (raw.Trim().Length == 0 || raw.StartsWith('#'))
            {
                continue;
            }
            var marker = raw[0] is '!' or '?' ? raw[0] : ' ';
            var text = marker == ' ' ? raw : raw[1..];
            entries.Add(new MetarCorpusEntry(i + 1, text, marker == '!', marker == '?'));
        }
        return entries;
    }
}

/// <summary>One corpus report with its 1-based line number and what the corpus expects of it.</summary>
internal sealed record MetarCorpusEntry(int Line, string Text, bool MustRefuse, bool HasUnknownGroups);
