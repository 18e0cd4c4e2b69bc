using Microsoft.Extensions.Options;

namespace OpsLvp.Web.Hosting;

public static class ConfigurationShapeExtensions
{
    /// <summary>Adds a start-time check that the options' section has the shape of <typeparamref name="TOptions"/> (<see cref="ConfigurationShape"/>).</summary>
    public static OptionsBuilder<TOptions> ValidateShape<TOptions>(this OptionsBuilder<TOptions> builder, IConfiguration configuration, string sectionName)
        where TOptions : class
    {
        ArgumentNullException.ThrowIfNull(builder);
        builder.Services.AddSingleton<IValidateOptions<TOptions>>(new ConfigurationShapeValidator<TOptions>(configuration, sectionName));
        return builder;
    }
}
