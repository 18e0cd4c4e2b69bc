using System.Net;

namespace OpsLvp.Web.Hosting;

/// <summary>
/// Configuration section <c>Network</c>: the reverse proxies whose <c>X-Forwarded-For</c> and <c>X-Forwarded-Proto</c>
/// the app believes (docs/deployment.md "Behind a reverse proxy"). Empty (the default): the headers are ignored, so a
/// client talking to the app directly cannot choose the address its sign-in attempts are counted and audited under.
/// </summary>
public sealed class NetworkOptions
{
    public const string SectionName = "Network";

    /// <summary>Addresses (<c>172.30.77.10</c>, <c>::1</c>) or networks in CIDR form (<c>10.0.0.0/24</c>) of the trusted proxies.</summary>
    public IList<string> TrustedProxies { get; } = [];

    /// <summary>The trusted proxies as networks (a single address is a network of one).</summary>
    /// <exception cref="FormatException">An entry is neither an address nor a CIDR network (the message names it).</exception>
    public IReadOnlyList<IPNetwork> TrustedNetworks()
    {
        var networks = new List<IPNetwork>();
        for (var i = 0; i < TrustedProxies.Count; i++)
        {
            var text = (TrustedProxies[i] ?? "").Trim();
            // IPAddress.TryParse also takes "10" as 0.0.0.10; an IPv4 address must be written with its four parts
            if (IPAddress.TryParse(text, out var address) && !text.Contains('/', StringComparison.Ordinal)
                && (address.AddressFamily != System.Net.Sockets.AddressFamily.InterNetwork || text.Count(c => c == '.') == 3))
            {
                networks.Add(new IPNetwork(address, address.AddressFamily == System.Net.Sockets.AddressFamily.InterNetwork ? 32 : 128));
            }
            else if (IPNetwork.TryParse(text, out var network))
            {
                networks.Add(network);
            }
            else
            {
                throw new FormatException($"{SectionName}:{nameof(TrustedProxies)}:{i} must be an IP address or a network in CIDR form (e.g. 10.0.0.0/24), not '{text}'.");
            }
        }
        return networks;
    }
}
