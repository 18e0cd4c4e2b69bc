using System.Text;

namespace OpsLvp.Web.Tests.Deployment;

/// <summary>
/// Reads an nginx configuration file into directives (nginx's own syntax: <c>name args;</c> or <c>name args { … }</c>,
/// <c>#</c> comments, single or double quotes), so tests can check what the file says rather than search its text.
/// </summary>
public static class NginxConf
{
    /// <summary>The file's top level as the block of a directive without a name.</summary>
    /// <exception cref="FormatException">Unbalanced braces, an unterminated quote or a directive without its <c>;</c>.</exception>
    public static NginxDirective Parse(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var tokens = Tokens(text).ToList();
        var position = 0;
        var top = ReadBlock(tokens, ref position, nested: false);
        return new NginxDirective("", [], top);
    }

    public static NginxDirective Load(string path) => Parse(File.ReadAllText(path));

    private static List<NginxDirective> ReadBlock(List<(string Text, bool Quoted)> tokens, ref int position, bool nested)
    {
        var block = new List<NginxDirective>();
        var words = new List<string>();
        while (position < tokens.Count)
        {
            var (text, quoted) = tokens[position++];
            if (!quoted && text == ";")
            {
                if (words.Count == 0)
                {
                    throw new FormatException("an empty directive (a lone ';')");
                }
                block.Add(new NginxDirective(words[0], words.Skip(1).ToList(), []));
                words = [];
            }
            else if (!quoted && text == "{")
            {
                if (words.Count == 0)
                {
                    throw new FormatException("a block without a directive name");
                }
                var inner = ReadBlock(tokens, ref position, nested: true);
                block.Add(new NginxDirective(words[0], words.Skip(1).ToList(), inner));
                words = [];
            }
            else if (!quoted && text == "}")
            {
                if (!nested || words.Count > 0)
                {
                    throw new FormatException(nested ? $"directive '{string.Join(' ', words)}' has no ';'" : "a '}' without its '{'");
                }
                return block;
            }
            else
            {
                words.Add(text);
            }
        }
        if (nested || words.Count > 0)
        {
            throw new FormatException(nested ? "a '{' without its '}'" : $"directive '{string.Join(' ', words)}' has no ';'");
        }
        return block;
    }

    private static IEnumerable<(string Text, bool Quoted)> Tokens(string text)
    {
        var i = 0;
        while (i < text.Length)
        {
            var c = text[i];
            if (char.IsWhiteSpace(c))
            {
                i++;
            }
            else if (c == '#')
            {
                while (i < text.Length && text[i] != '\n')
                {
                    i++;
                }
            }
            else if (c is ';' or '{' or '}')
            {
                i++;
                yield return (c.ToString(), false);
            }
            else if (c is '"' or '\'')
            {
                var end = text.IndexOf(c, i + 1);
                if (end < 0)
                {
                    throw new FormatException("an unterminated quote");
                }
                yield return (text[(i + 1)..end], true);
                i = end + 1;
            }
            else
            {
                var word = new StringBuilder();
                while (i < text.Length && !char.IsWhiteSpace(text[i]) && text[i] is not (';' or '{' or '}'))
                {
                    word.Append(text[i++]);
                }
                yield return (word.ToString(), false);
            }
        }
    }
}
