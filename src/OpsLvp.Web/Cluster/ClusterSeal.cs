using System.Security.Cryptography;
using Microsoft.AspNetCore.DataProtection;

namespace OpsLvp.Web.Cluster;

/// <summary>
/// Seals the messages nodes send each other over Redis (forwarded commands and their outcomes) with ASP.NET Core Data
/// Protection: authenticated encryption under the installation's key ring, which lives in the database every node
/// shares (docs/access.md "Commands between nodes", docs/engine.md R76). Something published on Redis by anyone without
/// that key ring does not open, and a sealed message changed in transit does not open either. Each kind of message has
/// its own purpose, so an outcome cannot be passed off as a command.
/// </summary>
public sealed class ClusterSeal(IDataProtectionProvider provider)
{
    /// <summary>Purpose of forwarded commands.</summary>
    public const string CommandPurpose = "OpsLvp.Cluster.ForwardedCommand.v1";

    /// <summary>Purpose of the leader's outcomes.</summary>
    public const string OutcomePurpose = "OpsLvp.Cluster.ForwardedOutcome.v1";

    private readonly IDataProtector _commands = provider.CreateProtector(CommandPurpose);
    private readonly IDataProtector _outcomes = provider.CreateProtector(OutcomePurpose);

    public string SealCommand(string json) => _commands.Protect(json);

    public string SealOutcome(string json) => _outcomes.Protect(json);

    /// <summary>The command's JSON, or null with <paramref name="why"/> when it was not sealed by a node of this installation.</summary>
    public string? OpenCommand(string sealedText, out string? why) => Open(_commands, sealedText, out why);

    /// <summary>The outcome's JSON, or null with <paramref name="why"/> when it was not sealed by a node of this installation.</summary>
    public string? OpenOutcome(string sealedText, out string? why) => Open(_outcomes, sealedText, out why);

    private static string? Open(IDataProtector protector, string sealedText, out string? why)
    {
        try
        {
            why = null;
            return protector.Unprotect(sealedText);
        }
        catch (Exception ex) when (ex is CryptographicException or FormatException)
        {
            why = $"not sealed by a node of this installation ({ex.Message})";
            return null;
        }
    }
}
