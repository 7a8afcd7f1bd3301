using Partwise.Core.Ratios;

namespace Partwise.Core.Selection;

/// <summary>
/// The graph of a ratio set: a node per side that the ratios use (a part, a named amalgamation, an unnamed sum such as
/// <c>(Ca+Mg)</c>, or a geometric mean such as <c>g(Ca,Mg)</c>) and an edge per ratio from its numerator to its denominator.
/// </summary>
/// <param name="Nodes">Node names in order of first use.</param>
/// <param name="Edges">One edge per ratio, in the order of the ratios.</param>
/// <param name="Acyclic">Whether the graph, read as undirected, has no cycle (two ratios between the same two nodes make one).</param>
/// <param name="Connected">Whether the nodes the ratios use form one connected component (true for an empty graph).</param>
/// <remarks>For pairwise ratios, J − 1 edges that are acyclic and connected over all J parts (a spanning tree) explain all of
/// the log-ratio variance, and a cycle adds nothing (Greenacre 2019, Math. Geosci. 51:649-682). Nodes that are sums of parts
/// overlap in content with the part nodes, so for mixed sets the graph describes the set but <see cref="RatioSelectionResult.Invertible"/>
/// is what says whether it determines the composition.</remarks>
public sealed record RatioGraph(IReadOnlyList<string> Nodes, IReadOnlyList<RatioEdge> Edges, bool Acyclic, bool Connected)
{
    /// <summary>Builds the graph of <paramref name="ratios"/>; a side that equals a named amalgamation is that amalgamation's node.</summary>
    /// <param name="parts">The part names the ratios' indices refer to.</param>
    /// <param name="ratios">The ratios, in order.</param>
    /// <param name="amalgamations">Named amalgamations, whose names label the sides that equal them.</param>
    public static RatioGraph Build(IReadOnlyList<string> parts, IReadOnlyList<LogRatio> ratios, IReadOnlyList<NamedAmalgamation>? amalgamations = null)
    {
        ArgumentNullException.ThrowIfNull(parts);
        ArgumentNullException.ThrowIfNull(ratios);
        var named = new List<(HashSet<string> Set, string Name)>();
        foreach (var a in amalgamations ?? [])
        {
            named.Add((new HashSet<string>(a.Parts, StringComparer.Ordinal), a.Name));
        }

        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        var nodes = new List<string>();
        var edges = new List<RatioEdge>(ratios.Count);
        var parent = new List<int>();
        var acyclic = true;

        int Node(string name)
        {
            if (!index.TryGetValue(name, out var id))
            {
                id = nodes.Count;
                index[name] = id;
                nodes.Add(name);
                parent.Add(id);
            }

            return id;
        }

        int Root(int x)
        {
            while (parent[x] != x)
            {
                parent[x] = parent[parent[x]];
                x = parent[x];
            }

            return x;
        }

        foreach (var ratio in ratios)
        {
            var from = SideName(parts, ratio.Numerator, ratio.Kind, named);
            var to = SideName(parts, ratio.Denominator, ratio.Kind, named);
            edges.Add(new RatioEdge(from, to, ratio.Label));
            int a = Root(Node(from)), b = Root(Node(to));
            if (a == b)
            {
                acyclic = false;
            }
            else
            {
                parent[a] = b;
            }
        }

        var roots = new HashSet<int>();
        for (var i = 0; i < nodes.Count; i++)
        {
            roots.Add(Root(i));
        }

        return new RatioGraph(nodes, edges, acyclic, roots.Count <= 1);
    }

    private static string SideName(IReadOnlyList<string> parts, IReadOnlyList<int> side, RatioKind kind, List<(HashSet<string> Set, string Name)> named)
    {
        if (kind == RatioKind.Balance)
        {
            return "g(" + string.Join(',', side.Select(j => parts[j])) + ")";
        }

        if (side.Count == 1)
        {
            return parts[side[0]];
        }

        foreach (var (set, name) in named)
        {
            if (set.Count == side.Count && side.All(j => set.Contains(parts[j])))
            {
                return name;
            }
        }

        return "(" + string.Join('+', side.Select(j => parts[j])) + ")";
    }
}

/// <summary>One ratio as an edge of a <see cref="RatioGraph"/>.</summary>
/// <param name="From">The numerator's node.</param>
/// <param name="To">The denominator's node.</param>
/// <param name="Label">The ratio's label.</param>
public sealed record RatioEdge(string From, string To, string Label);
