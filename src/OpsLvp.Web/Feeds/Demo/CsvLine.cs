using System.Text;

namespace OpsLvp.Web.Feeds.Demo;

/// <summary>Splits one CSV line (RFC 4180 quoting with <c>""</c> escapes; no line breaks inside fields).</summary>
public static class CsvLine
{
    /// <summary>The fields, trimmed outside quotes; null when a quoted field is not closed.</summary>
    public static List<string>? Split(string line)
    {
        var fields = new List<string>();
        var current = new StringBuilder();
        var inQuotes = false;
        var wasQuoted = false;
        for (var i = 0; i < line.Length; i++)
        {
            var c = line[i];
            if (inQuotes)
            {
                if (c == '"' && i + 1 < line.Length && line[i + 1] == '"')
                {
                    current.Append('"');
                    i++;
                }
                else if (c == '"')
                {
                    inQuotes = false;
                }
                else
                {
                    current.Append(c);
                }
            }
            else if (c == '"' && current.ToString().Trim().Length == 0)
            {
                current.Clear();
                inQuotes = true;
                wasQuoted = true;
            }
            else if (c == ',')
            {
                fields.Add(wasQuoted ? current.ToString() : current.ToString().Trim());
                current.Clear();
                wasQuoted = false;
            }
            else
            {
                current.Append(c);
            }
        }

        if (inQuotes)
        {
            return null;
        }

        fields.Add(wasQuoted ? current.ToString() : current.ToString().Trim());
        return fields;
    }
}
