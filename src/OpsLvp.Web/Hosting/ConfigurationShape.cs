using System.Collections;
using System.Reflection;

namespace OpsLvp.Web.Hosting;

/// <summary>
/// Checks that configuration has the shape of the options type it binds to. The binder silently skips a single
/// value where a section is expected (<c>Feeds:Push:ApiKeys:0=&lt;key&gt;</c> instead of <c>…:0:Name</c> and
/// <c>…:0:Key</c>) and a section where a single value is expected; each such setting is named here instead.
/// </summary>
public static class ConfigurationShape
{
    /// <summary>One line per setting of <paramref name="section"/> whose shape does not fit <paramref name="type"/>.</summary>
    public static List<string> Problems(IConfigurationSection section, Type type)
    {
        ArgumentNullException.ThrowIfNull(section);
        ArgumentNullException.ThrowIfNull(type);
        var problems = new List<string>();
        Check(section, type, problems, depth: 0);
        return problems;
    }

    private static void Check(IConfigurationSection section, Type type, List<string> problems, int depth)
    {
        if (depth > 16)
        {
            return;
        }

        type = Nullable.GetUnderlyingType(type) ?? type;
        var children = section.GetChildren().ToList();
        if (IsSingleValue(type))
        {
            if (children.Count > 0)
            {
                problems.Add($"{section.Path} must be a single value, not a section (found {children[0].Path}).");
            }

            return;
        }

        if (!string.IsNullOrEmpty(section.Value))
        {
            problems.Add(ElementType(type) is not null
                ? $"{section.Path} must be a list ({section.Path}:0, {section.Path}:1, …), not a single value."
                : $"{section.Path} must be a section with its own settings ({Example(section.Path, type)}), not a single value.");
            return;
        }

        if (DictionaryValueType(type) is { } valueType)
        {
            foreach (var child in children)
            {
                Check(child, valueType, problems, depth + 1);
            }

            return;
        }

        if (ElementType(type) is { } elementType)
        {
            foreach (var child in children)
            {
                Check(child, elementType, problems, depth + 1);
            }

            return;
        }

        var properties = type.GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.CanWrite || !IsSingleValue(p.PropertyType)).ToList();
        foreach (var child in children)
        {
            var property = properties.FirstOrDefault(p => string.Equals(p.Name, child.Key, StringComparison.OrdinalIgnoreCase));
            if (property is not null)
            {
                Check(child, property.PropertyType, problems, depth + 1);
            }
        }
    }

    private static string Example(string path, Type type)
    {
        var names = type.GetProperties(BindingFlags.Public | BindingFlags.Instance).Take(2).Select(p => $"{path}:{p.Name}").ToList();
        return names.Count == 0 ? path + ":…" : string.Join(", ", names);
    }

    private static bool IsSingleValue(Type type) =>
        type.IsPrimitive || type.IsEnum || type == typeof(string) || type == typeof(decimal) || type == typeof(TimeSpan)
        || type == typeof(DateTime) || type == typeof(DateTimeOffset) || type == typeof(Uri) || type == typeof(Guid);

    private static Type? ElementType(Type type)
    {
        if (type.IsArray)
        {
            return type.GetElementType();
        }

        if (type == typeof(string) || !typeof(IEnumerable).IsAssignableFrom(type))
        {
            return null;
        }

        return type.GetInterfaces().Append(type)
            .Where(i => i.IsGenericType && i.GetGenericTypeDefinition() == typeof(IEnumerable<>))
            .Select(i => i.GetGenericArguments()[0])
            .FirstOrDefault();
    }

    private static Type? DictionaryValueType(Type type) =>
        type.GetInterfaces().Append(type)
            .Where(i => i.IsGenericType && (i.GetGenericTypeDefinition() == typeof(IDictionary<,>) || i.GetGenericTypeDefinition() == typeof(IReadOnlyDictionary<,>)))
            .Select(i => i.GetGenericArguments()[1])
            .FirstOrDefault();
}
