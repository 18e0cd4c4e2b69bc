using YamlDotNet.Serialization;

namespace OpsLvp.Web.Tests.Deployment;

/// <summary>
/// The repository's <c>docker-compose.yml</c> read with YamlDotNet (there is no Docker engine in the tests: the file is
/// parsed, not run). Services, volumes and networks as nested dictionaries and lists of strings.
/// </summary>
public sealed class ComposeFile
{
    private ComposeFile(string folder, IReadOnlyDictionary<string, object?> root)
    {
        Folder = folder;
        Root = root;
    }

    /// <summary>The folder holding the file (relative paths in it start there).</summary>
    public string Folder { get; }

    public IReadOnlyDictionary<string, object?> Root { get; }

    public IReadOnlyDictionary<string, object?> Services => Map(Root, "services");

    /// <summary>The repository root: the folder holding OpsLvp.sln, searched upwards from the test assembly.</summary>
    public static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "OpsLvp.sln")))
            {
                return dir.FullName;
            }
        }
        throw new InvalidOperationException($"no OpsLvp.sln above {AppContext.BaseDirectory}");
    }

    public static ComposeFile Load(string? path = null)
    {
        path ??= Path.Combine(RepositoryRoot(), "docker-compose.yml");
        var root = new DeserializerBuilder().Build().Deserialize<Dictionary<object, object?>>(File.ReadAllText(path));
        return new ComposeFile(Path.GetDirectoryName(Path.GetFullPath(path))!, Normalise(root));
    }

    /// <summary>The services listing <paramref name="profile"/> in their <c>profiles</c>, by name.</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, object?>> InProfile(string profile) =>
        Services.Where(s => Strings(AsMap(s.Value), "profiles").Contains(profile))
            .ToDictionary(s => s.Key, s => AsMap(s.Value));

    /// <summary>The services without profiles (started by a plain <c>docker compose up</c>).</summary>
    public IReadOnlyDictionary<string, IReadOnlyDictionary<string, object?>> Default() =>
        Services.Where(s => Strings(AsMap(s.Value), "profiles").Count == 0)
            .ToDictionary(s => s.Key, s => AsMap(s.Value));

    public static IReadOnlyDictionary<string, object?> AsMap(object? value) =>
        value as IReadOnlyDictionary<string, object?> ?? throw new Xunit.Sdk.XunitException($"expected a mapping, found {value ?? "nothing"}");

    /// <summary>A mapping under <paramref name="key"/>; empty when absent.</summary>
    public static IReadOnlyDictionary<string, object?> Map(IReadOnlyDictionary<string, object?> node, string key) =>
        node.TryGetValue(key, out var value) && value is not null ? AsMap(value) : new Dictionary<string, object?>();

    /// <summary>A scalar under <paramref name="key"/>, or null.</summary>
    public static string? Text(IReadOnlyDictionary<string, object?> node, string key) =>
        node.TryGetValue(key, out var value) ? value as string : null;

    /// <summary>A list of scalars under <paramref name="key"/> (or a mapping's keys: compose allows both forms); empty when absent.</summary>
    public static IReadOnlyList<string> Strings(IReadOnlyDictionary<string, object?> node, string key) =>
        !node.TryGetValue(key, out var value) || value is null ? []
        : value is IReadOnlyList<object?> list ? list.Select(v => v as string ?? throw new Xunit.Sdk.XunitException($"{key}: expected text, found {v}")).ToList()
        : value is IReadOnlyDictionary<string, object?> map ? map.Keys.ToList()
        : throw new Xunit.Sdk.XunitException($"{key}: expected a list, found {value}");

    /// <summary>A service's environment as name → value, whichever form (mapping or <c>NAME=value</c> list) it is written in.</summary>
    public static IReadOnlyDictionary<string, string> Environment(IReadOnlyDictionary<string, object?> service)
    {
        if (service.TryGetValue("environment", out var value) && value is IReadOnlyList<object?> list)
        {
            return list.Cast<string>().Select(e => e.Split('=', 2)).ToDictionary(p => p[0], p => p.Length > 1 ? p[1] : "");
        }
        return Map(service, "environment").ToDictionary(e => e.Key, e => e.Value as string ?? "");
    }

    private static IReadOnlyDictionary<string, object?> Normalise(Dictionary<object, object?> map) =>
        map.ToDictionary(e => (string)e.Key, e => NormaliseValue(e.Value));

    private static object? NormaliseValue(object? value) => value switch
    {
        Dictionary<object, object?> map => Normalise(map),
        List<object?> list => list.Select(NormaliseValue).ToList(),
        _ => value,
    };
}
