using System.Globalization;
using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Feeds;

/// <summary>Checks <see cref="FeedsOptions"/>; each failure names the setting (e.g. <c>Feeds:Http:0:Url</c>).</summary>
public sealed class FeedsOptionsValidator : IValidateOptions<FeedsOptions>
{
    /// <summary>Shortest accepted push key, characters.</summary>
    public const int MinKeyLength = 16;

    public ValidateOptionsResult Validate(string? name, FeedsOptions options)
    {
        var errors = Errors(options);
        return errors.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(errors);
    }

    public static List<string> Errors(FeedsOptions options)
    {
        var errors = new List<string>();
        if (options.PipelineCapacity is < 1 or > 1_000_000)
        {
            errors.Add(Msg($"Feeds:PipelineCapacity must be between 1 and 1000000 (got {options.PipelineCapacity})."));
        }

        if (options.HealthAuditInterval < TimeSpan.Zero || options.HealthAuditInterval > TimeSpan.FromHours(1))
        {
            errors.Add("Feeds:HealthAuditInterval must be between 00:00:00 and 01:00:00.");
        }

        var names = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        for (var i = 0; i < options.Http.Count; i++)
        {
            var feed = options.Http[i];
            var at = Msg($"Feeds:Http:{i}");
            if (string.IsNullOrWhiteSpace(feed.Name))
            {
                errors.Add($"{at}:Name must be set.");
            }
            else if (!names.Add(feed.Name))
            {
                errors.Add($"{at}:Name '{feed.Name}' is used by another feed.");
            }

            if (!Uri.TryCreate(feed.Url, UriKind.Absolute, out var uri) || (uri.Scheme != Uri.UriSchemeHttp && uri.Scheme != Uri.UriSchemeHttps))
            {
                errors.Add($"{at}:Url must be an absolute http or https URL (got '{feed.Url}').");
            }

            CheckPolling(errors, at, feed.PollInterval, feed.Timeout, feed.Retries);

            if (feed.RetryDelay < TimeSpan.Zero || feed.RetryDelay > TimeSpan.FromMinutes(1))
            {
                errors.Add($"{at}:RetryDelay must be between 00:00:00 and 00:01:00.");
            }

            if (feed.MaxResponseBytes is < 1024 or > 64 * 1024 * 1024)
            {
                errors.Add(Msg($"{at}:MaxResponseBytes must be between 1024 and 67108864 (got {feed.MaxResponseBytes})."));
            }

            if (feed.StaleAfter is { } stale && stale <= TimeSpan.Zero)
            {
                errors.Add($"{at}:StaleAfter must be positive when set.");
            }
        }

        var metarNames = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        for (var i = 0; i < options.Metar.Count; i++)
        {
            var feed = options.Metar[i];
            var at = Msg($"Feeds:Metar:{i}");
            if (string.IsNullOrWhiteSpace(feed.Name))
            {
                errors.Add($"{at}:Name must be set.");
            }
            else if (!metarNames.Add(feed.Name))
            {
                errors.Add($"{at}:Name '{feed.Name}' is used by another METAR feed.");
            }
            if (string.IsNullOrWhiteSpace(feed.Source))
            {
                errors.Add($"{at}:Source must be an http(s) URL or a file path.");
            }
            CheckPolling(errors, at, feed.PollInterval, feed.Timeout, feed.Retries);
        }

        var tafNames = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        for (var i = 0; i < options.Taf.Count; i++)
        {
            var feed = options.Taf[i];
            var at = Msg($"Feeds:Taf:{i}");
            if (string.IsNullOrWhiteSpace(feed.Name))
            {
                errors.Add($"{at}:Name must be set.");
            }
            else if (!tafNames.Add(feed.Name))
            {
                errors.Add($"{at}:Name '{feed.Name}' is used by another TAF feed.");
            }
            if (string.IsNullOrWhiteSpace(feed.Source))
            {
                errors.Add($"{at}:Source must be an http(s) URL or a file path.");
            }
            CheckPolling(errors, at, feed.PollInterval, feed.Timeout, feed.Retries);
            if (feed.StaleAfter is { } stale && stale <= TimeSpan.Zero)
            {
                errors.Add($"{at}:StaleAfter must be positive when set.");
            }
        }

        var keyNames = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        for (var i = 0; i < options.Push.ApiKeys.Count; i++)
        {
            var key = options.Push.ApiKeys[i];
            var at = Msg($"Feeds:Push:ApiKeys:{i}");
            if (string.IsNullOrWhiteSpace(key.Name))
            {
                errors.Add($"{at}:Name must be set.");
            }
            else if (!keyNames.Add(key.Name))
            {
                errors.Add($"{at}:Name '{key.Name}' is used by another key.");
            }

            if (string.IsNullOrEmpty(key.Key) || key.Key.Length < MinKeyLength)
            {
                errors.Add(Msg($"{at}:Key must be at least {MinKeyLength} characters."));
            }
        }

        if (options.Push.MaxBodyBytes is < 1024 or > 64 * 1024 * 1024)
        {
            errors.Add(Msg($"Feeds:Push:MaxBodyBytes must be between 1024 and 67108864 (got {options.Push.MaxBodyBytes})."));
        }

        if (options.Push.MaxReadings is < 1 or > ReadingJsonParser.MaxItems)
        {
            errors.Add(Msg($"Feeds:Push:MaxReadings must be between 1 and {ReadingJsonParser.MaxItems} (got {options.Push.MaxReadings})."));
        }

        return errors;
    }

    /// <summary>The polling settings HTTP and METAR feeds share (the same retry/timeout pipeline runs both).</summary>
    private static void CheckPolling(List<string> errors, string at, TimeSpan pollInterval, TimeSpan timeout, int retries)
    {
        if (pollInterval < TimeSpan.FromMilliseconds(100) || pollInterval > TimeSpan.FromHours(1))
        {
            errors.Add($"{at}:PollInterval must be between 00:00:00.1 and 01:00:00.");
        }

        if (timeout < TimeSpan.FromMilliseconds(10) || timeout > TimeSpan.FromMinutes(5))
        {
            errors.Add($"{at}:Timeout must be between 00:00:00.01 and 00:05:00.");
        }

        if (retries is < 0 or > 10)
        {
            errors.Add(Msg($"{at}:Retries must be between 0 and 10 (got {retries})."));
        }
    }

    private static string Msg(FormattableString text) => text.ToString(CultureInfo.InvariantCulture);
}
