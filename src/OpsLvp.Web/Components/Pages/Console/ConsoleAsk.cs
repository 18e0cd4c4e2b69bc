using MudBlazor;
using OpsLvp.Core.Engine;

namespace OpsLvp.Web.Components.Pages.Console;

/// <summary>A console command to ask for: the dialog's words and the command built from the reason given.</summary>
/// <param name="Title">The dialog title, also naming the command in its outcome ("Cancel LVP: done — …").</param>
public sealed record ConsoleAsk(string Title, string Prompt, string ConfirmText, Color Color, Func<string, EngineCommand> Command)
{
    /// <summary>Show the values the command acts against beside the recovery thresholds, and ask a second time when the engine says it goes against the conditions.</summary>
    public bool ShowConditions { get; init; }

    /// <summary>The confirm button's words on the second ask.</summary>
    public string SecondConfirmText { get; init; } = "Yes, do it anyway";

    /// <summary>Checked after the reason is given, before sending: null to send, or why it is not sent.</summary>
    public Func<string?>? StillValid { get; init; }
}
