using OpsLvp.Core.Engine;

namespace OpsLvp.Core.Presentation;

/// <summary>What a screen says for one thing the engine waits for, naming checklist items by their texts when it knows them.</summary>
public static class WaitWords
{
    /// <summary>
    /// The engine's text, except that open safeguards (docs/engine.md R13) are named by <paramref name="itemText"/>
    /// (the profile's item texts) where it knows them, in the wording of <see cref="StatusNotes"/>.
    /// </summary>
    public static string Text(WaitingFor wait, Func<string, string?>? itemText)
    {
        ArgumentNullException.ThrowIfNull(wait);
        if (wait.Kind != WaitKind.Safeguards || itemText is null || wait.Subjects.Count == 0)
        {
            return wait.Text;
        }
        return $"{LvpEngine.SafeguardsIncompleteHeadline}: {string.Join("; ", wait.Subjects.Select(id => itemText(id) ?? id))} open";
    }
}
