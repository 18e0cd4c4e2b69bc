using System.Globalization;
using OpsLvp.Web.Hosting;
using Polly;
using Polly.Timeout;

namespace OpsLvp.Web.Feeds;

/// <summary>
/// The text source of a polled report feed (METAR, TAF): an HTTP(S) URL fetched with timeout and back-off retries, or
/// a file; and the words for a failed poll that the feed's health and log carry. One place for both pollers.
/// </summary>
internal static class TextFeedSource
{
    /// <summary>The URL when <paramref name="source"/> is an absolute HTTP(S) address, else null (a file path).</summary>
    public static Uri? HttpUrl(string source) =>
        Uri.TryCreate(source, UriKind.Absolute, out var url) && (url.Scheme == Uri.UriSchemeHttp || url.Scheme == Uri.UriSchemeHttps) ? url : null;

    /// <summary>Reads the whole text: GET for a URL (non-2xx throws), else the file resolved against the content root.</summary>
    public static async Task<string> ReadAsync(string source, Uri? url, HttpClient client, ResiliencePipeline<HttpResponseMessage> resilience, ContentPaths paths, CancellationToken stoppingToken)
    {
        if (url is null)
        {
            return await File.ReadAllTextAsync(paths.Resolve(source), stoppingToken);
        }
        using var response = await resilience.ExecuteAsync(async token => await client.GetAsync(url, HttpCompletionOption.ResponseContentRead, token), stoppingToken);
        if (!response.IsSuccessStatusCode)
        {
            throw new HttpRequestException(string.Create(CultureInfo.InvariantCulture, $"HTTP {(int)response.StatusCode} {response.ReasonPhrase}"), null, response.StatusCode);
        }
        return await response.Content.ReadAsStringAsync(stoppingToken);
    }

    /// <summary>What a failed poll says in the feed's health and the log.</summary>
    public static string Describe(Exception ex, TimeSpan timeout) => ex switch
    {
        TimeoutRejectedException => string.Create(CultureInfo.InvariantCulture, $"timed out after {timeout.TotalSeconds:0.###} s"),
        HttpRequestException h => "request failed: " + h.Message,
        IOException or UnauthorizedAccessException => "file not readable: " + ex.Message,
        _ => ex.GetType().Name + ": " + ex.Message,
    };
}
