namespace OpsLvp.Web.Tests.Infrastructure.Services;

/// <summary>One request in <see cref="NginxProcess.AccessLog"/>: the node(s) that served it (<c>127.0.0.1:port</c>, comma-separated when nginx tried more than one), the test client, the status and the request line.</summary>
public sealed record NginxLogLine(string Upstream, string Client, int Status, string Request);
