using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Hosting;

/// <summary>Fails validation of <typeparamref name="TOptions"/> when its configuration section has the wrong shape (<see cref="ConfigurationShape"/>).</summary>
public sealed class ConfigurationShapeValidator<TOptions>(IConfiguration configuration, string sectionName) : IValidateOptions<TOptions>
    where TOptions : class
{
    public ValidateOptionsResult Validate(string? name, TOptions options)
    {
        var problems = ConfigurationShape.Problems(configuration.GetSection(sectionName), typeof(TOptions));
        return problems.Count == 0 ? ValidateOptionsResult.Success : ValidateOptionsResult.Fail(problems);
    }
}
