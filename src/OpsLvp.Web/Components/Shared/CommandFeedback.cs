using MudBlazor;
using OpsLvp.Web.Commands;

namespace OpsLvp.Web.Components.Shared;

/// <summary>
/// The one way a command's outcome is told to the person who sent it (issue 13 "every command gets visible
/// feedback"): a snackbar naming the command and saying done, refused with the reason, or failed with why. Refusals
/// the page decides before sending (a proposal withdrawn while the reason was typed) come through here too.
/// </summary>
public static class CommandFeedback
{
    /// <summary>"Cancel LVP: done — LVP cancelled", "Cancel LVP: refused — nothing to cancel: the phase is normal".</summary>
    public static string Text(string command, CommandOutcome outcome)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        var verdict = outcome.Kind switch
        {
            CommandOutcomeKind.Applied => "done",
            CommandOutcomeKind.Refused => "refused",
            _ => "failed",
        };
        return $"{command}: {verdict} — {outcome.Message}";
    }

    /// <summary>Success when applied, warning when refused, error when it failed.</summary>
    public static Severity SeverityOf(CommandOutcome outcome)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        return outcome.Kind switch
        {
            CommandOutcomeKind.Applied => Severity.Success,
            CommandOutcomeKind.Refused => Severity.Warning,
            _ => Severity.Error,
        };
    }

    /// <summary>Shows the outcome; a refusal or failure stays until closed, a success goes after the usual time.</summary>
    public static void Show(ISnackbar snackbar, string command, CommandOutcome outcome)
    {
        ArgumentNullException.ThrowIfNull(snackbar);
        snackbar.Add(Text(command, outcome), SeverityOf(outcome), o =>
        {
            o.RequireInteraction = !outcome.Applied;
            o.ShowCloseIcon = true;
        });
    }
}
