using YamlDotNet.RepresentationModel;

namespace Partwise.Deployment.Tests.Support;

/// <summary>One Kubernetes object read from k8s/: its file, kind, name and its tree of mappings, lists and scalars.</summary>
internal sealed record Manifest(string File, string Kind, string ApiVersion, string Name, YamlMappingNode Root);

/// <summary>The objects of every <c>k8s/*.yaml</c> file (several documents per file allowed), parsed with YamlDotNet.</summary>
internal static class Manifests
{
    private static readonly Lazy<IReadOnlyList<Manifest>> Loaded = new(Load);

    /// <summary>Every object, in file order.</summary>
    public static IReadOnlyList<Manifest> All => Loaded.Value;

    /// <summary>The one object of a kind, failing when there is none or more than one.</summary>
    public static Manifest Single(string kind)
    {
        var matches = All.Where(m => m.Kind == kind).ToList();
        Assert.True(matches.Count == 1, $"expected one {kind} in k8s/, found {matches.Count}");
        return matches[0];
    }

    /// <summary>The object of a kind and name, failing when there is none.</summary>
    public static Manifest Named(string kind, string name) =>
        All.SingleOrDefault(m => m.Kind == kind && m.Name == name)
        ?? throw new Xunit.Sdk.XunitException($"no {kind} named {name} in k8s/");

    /// <summary>The files of k8s/.</summary>
    public static IEnumerable<string> Files() =>
        Directory.EnumerateFiles(Repository.PathOf("k8s"), "*.yaml").Order(StringComparer.Ordinal);

    private static List<Manifest> Load()
    {
        var manifests = new List<Manifest>();
        foreach (var file in Files())
        {
            var stream = new YamlStream();
            using (var reader = new StreamReader(file))
            {
                stream.Load(reader);
            }

            foreach (var document in stream.Documents)
            {
                var root = Assert.IsType<YamlMappingNode>(document.RootNode);
                var name = Path.GetFileName(file);
                manifests.Add(new Manifest(
                    name,
                    root.Text("kind"),
                    root.Text("apiVersion"),
                    root.Map("metadata").Text("name"),
                    root));
            }
        }

        return manifests;
    }
}

/// <summary>Reading a YAML tree by keys, failing with the path when a key is missing or of another shape.</summary>
internal static class YamlPaths
{
    /// <summary>The mapping under a key.</summary>
    public static YamlMappingNode Map(this YamlMappingNode node, string key) =>
        node.Child(key) as YamlMappingNode ?? throw new Xunit.Sdk.XunitException($"'{key}' is not a mapping at {node.Start}");

    /// <summary>The list under a key.</summary>
    public static YamlSequenceNode List(this YamlMappingNode node, string key) =>
        node.Child(key) as YamlSequenceNode ?? throw new Xunit.Sdk.XunitException($"'{key}' is not a list at {node.Start}");

    /// <summary>The mappings of the list under a key.</summary>
    public static IEnumerable<YamlMappingNode> Maps(this YamlMappingNode node, string key) =>
        node.List(key).Children.Select(c => c as YamlMappingNode ?? throw new Xunit.Sdk.XunitException($"an item of '{key}' is not a mapping at {c.Start}"));

    /// <summary>The scalar text under a key.</summary>
    public static string Text(this YamlMappingNode node, string key) =>
        (node.Child(key) as YamlScalarNode)?.Value ?? throw new Xunit.Sdk.XunitException($"'{key}' is not a scalar at {node.Start}");

    /// <summary>The integer under a key.</summary>
    public static int Integer(this YamlMappingNode node, string key) =>
        int.Parse(node.Text(key), System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>The boolean under a key.</summary>
    public static bool Flag(this YamlMappingNode node, string key) =>
        node.Text(key) switch
        {
            "true" => true,
            "false" => false,
            var other => throw new Xunit.Sdk.XunitException($"'{key}' is '{other}', not true or false, at {node.Start}"),
        };

    /// <summary>True when the mapping has the key.</summary>
    public static bool Has(this YamlMappingNode node, string key) => node.Children.ContainsKey(new YamlScalarNode(key));

    /// <summary>A mapping of scalars as a dictionary (labels, selectors, ConfigMap data).</summary>
    public static IReadOnlyDictionary<string, string> Strings(this YamlMappingNode node, string key) =>
        node.Map(key).Children.ToDictionary(
            e => ((YamlScalarNode)e.Key).Value!,
            e => (e.Value as YamlScalarNode)?.Value ?? throw new Xunit.Sdk.XunitException($"'{key}' holds a non-scalar at {e.Value.Start}"),
            StringComparer.Ordinal);

    private static YamlNode Child(this YamlMappingNode node, string key) =>
        node.Children.TryGetValue(new YamlScalarNode(key), out var child)
            ? child
            : throw new Xunit.Sdk.XunitException($"no '{key}' at {node.Start}");
}
