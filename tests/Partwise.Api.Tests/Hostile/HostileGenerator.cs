using System.Globalization;
using System.Text;
using System.Text.Json.Nodes;

namespace Partwise.Api.Tests.Hostile;

/// <summary>The limits the generator aims at: the host's configured values, so "within" and "over" mean something.</summary>
/// <param name="MaxBodyBytes">Partwise:Limits:MaxBodyBytes.</param>
/// <param name="MaxParts">Partwise:Limits:MaxParts.</param>
/// <param name="MaxRows">Partwise:Limits:MaxRows.</param>
/// <param name="MaxScreeningSamples">Partwise:Limits:MaxScreeningSamples.</param>
public sealed record HostileLimits(long MaxBodyBytes, int MaxParts, int MaxRows, int MaxScreeningSamples);

/// <summary>
/// Seeded hostile requests for every route: each route gets wrong methods, bad path ids, bad query values, absurd
/// Accept and If-None-Match headers, and, where the OpenAPI document gives a body example, mutations of that example
/// (character edits, hostile values in place of each kind of node, changed shapes, whole non-request bodies, arrays
/// within and over the limits, wrong content types; for CSV ragged rows, quotes, byte-order marks, other delimiters).
/// The same seed gives the same cases.
/// </summary>
public sealed class HostileGenerator(IReadOnlyList<HostileRoute> routes, Func<HostileRoute, string> fillPath, HostileLimits limits, int seed)
{
    private const string Placeholder = "__hostile_placeholder__";
    private const string JsonAlphabet = "{}[],:\"0123456789.-+eE \\nulltrueNaNabc/";
    private const string CsvAlphabet = ",;\t\"\n\r0123456789.-eE abc\uFEFF";

    /// <summary>Every case for every route, in a fixed order.</summary>
    public IEnumerable<HostileCase> Cases() => routes.SelectMany(ForRoute);

    /// <summary>The valid request of a route: its path filled with real ids, its JSON example (if any) as the body.</summary>
    public HostileCase Valid(HostileRoute route)
    {
        ArgumentNullException.ThrowIfNull(route);
        return route.JsonExample is { } json
            ? Make(route, "valid", route.Method, fillPath(route), json, "application/json")
            : MakeBytes(route, "valid", route.Method, fillPath(route), null, null);
    }

    private IEnumerable<HostileCase> ForRoute(HostileRoute route)
    {
        var random = new Random(seed ^ StableHash(route.Key));
        var path = fillPath(route);
        var valid = Valid(route);
        var cases = new List<HostileCase>();

        // Methods the template does not map at all (a mapped one with a real id could delete what the others need).
        var mapped = routes.Where(r => r.Template == route.Template).Select(r => r.Method).ToHashSet(StringComparer.Ordinal);
        foreach (var method in HostileValues.Methods.Where(m => !mapped.Contains(m)))
        {
            cases.Add(valid with { Family = "method", Method = method });
        }

        if (route.Template.Contains('{', StringComparison.Ordinal))
        {
            foreach (var id in HostileValues.PathIds)
            {
                cases.Add(valid with { Family = "path-id", Target = ReplaceParameters(route.Template, id) });
            }
        }

        foreach (var name in route.QueryNames.Append("unknownParameter"))
        {
            var values = HostileValues.NamedQueryValues.TryGetValue(name, out var named) ? named : Pick(HostileValues.QueryValues, 8, random);
            foreach (var value in values)
            {
                cases.Add(valid with { Family = "query", Target = $"{path}?{name}={value}" });
            }

            cases.Add(valid with { Family = "query", Target = $"{path}?{name}=1&{name}=2&{name}" });
        }

        cases.Add(valid with { Family = "query", Target = path + "?&&==&" });
        cases.Add(valid with { Family = "query", Target = path + "?" + string.Join("&", Enumerable.Range(0, 300).Select(i => $"p{i}={i}")) });

        foreach (var accept in HostileValues.Accepts)
        {
            cases.Add(valid with { Family = "accept", Headers = [new("Accept", accept)] });
        }

        if (route.Method == "GET")
        {
            foreach (var tag in HostileValues.IfNoneMatch)
            {
                cases.Add(valid with { Family = "if-none-match", Headers = [new("If-None-Match", tag)] });
            }
        }

        if (route.JsonExample is { } json)
        {
            cases.AddRange(JsonCases(route, path, json, random));
        }

        if (route.CsvExample is { } csv)
        {
            cases.AddRange(CsvCases(route, path, csv, random));
        }

        // A route with no body example still gets bodies it does not expect.
        if (route.JsonExample is null && route.CsvExample is null)
        {
            foreach (var body in Pick(HostileValues.JsonBodies, 6, random))
            {
                cases.Add(Make(route, "unexpected-body", route.Method, path, body, "application/json"));
            }
        }

        return cases;
    }

    private IEnumerable<HostileCase> JsonCases(HostileRoute route, string path, string json, Random random)
    {
        HostileCase Json(string family, string body, string? type = "application/json") => Make(route, family, route.Method, path, body, type);

        for (var i = 0; i < 60; i++)
        {
            yield return Json("json-edit", Edit(json, JsonAlphabet, random, 1 + random.Next(4)));
        }

        // Every node of the example in turn (cycling) gets a random hostile literal; then random nodes get more.
        var nodeCount = Nodes(JsonNode.Parse(json)!).Count;
        for (var i = 0; i < Math.Max(nodeCount, 80); i++)
        {
            var literal = HostileValues.JsonLiterals[random.Next(HostileValues.JsonLiterals.Length)];
            yield return Json("json-value", ReplaceNode(json, i < nodeCount ? i : random.Next(nodeCount), literal));
        }

        foreach (var body in ShapeChanges(json, random))
        {
            yield return Json("json-shape", body);
        }

        foreach (var body in HostileValues.JsonBodies)
        {
            yield return Json("json-whole", body);
        }

        yield return Json("json-whole", "\uFEFF" + json);
        yield return Json("json-whole", json + "{}");
        yield return Json("json-whole", json + new string(' ', 1000) + "x");
        yield return Json("json-whole", json[..(json.Length / 2)]);
        yield return Json("json-whole", json[..^1]);
        foreach (var body in RandomBytes(random, 8))
        {
            yield return MakeBytes(route, "json-bytes", route.Method, path, body, "application/json");
        }

        yield return MakeBytes(route, "json-bytes", route.Method, path, [.. Encoding.UTF8.GetBytes(json[..10]), 0xC3, 0x28, 0xFF, .. Encoding.UTF8.GetBytes(json[10..])], "application/json");

        foreach (var body in LargeJson(json))
        {
            yield return Json("json-large", body);
        }

        foreach (var type in HostileValues.ContentTypes)
        {
            yield return Json("content-type", json, type);
        }

        yield return Json("content-type", json, null);
    }

    private IEnumerable<HostileCase> CsvCases(HostileRoute route, string path, string csv, Random random)
    {
        HostileCase Csv(string family, string body, string? type = "text/csv") => Make(route, family, route.Method, path, body, type);

        for (var i = 0; i < 40; i++)
        {
            yield return Csv("csv-edit", Edit(csv, CsvAlphabet, random, 1 + random.Next(4)));
        }

        var lines = csv.TrimEnd('\n').Split('\n');
        var header = lines[0];
        var data = lines.Skip(1).ToArray();
        var last = data.Length > 0 ? data[^1] : header;
        string Join(IEnumerable<string> l) => string.Join("\n", l) + "\n";

        // Ragged rows, quotes, byte-order marks, other delimiters, empty and header-only bodies, odd line ends.
        string[] shapes =
        [
            Join(lines.Append(last[..last.LastIndexOf(',')])),
            Join(lines.Append(last + ",9.9")),
            Join(lines.Append(",")),
            Join(lines.Append(string.Concat(Enumerable.Repeat(",", 50)))),
            Join(new[] { header[..header.LastIndexOf(',')] }.Concat(data)),
            Join(lines.Append("\"" + last)),
            Join(lines.Append("\"a\nb\"," + last[(last.IndexOf(',') + 1)..])),
            Join(lines.Append("a\"b\"c," + last[(last.IndexOf(',') + 1)..])),
            Join(lines.Append("\"\"," + last[(last.IndexOf(',') + 1)..])),
            Join(new[] { "\"" + header.Replace(",", "\",\"", StringComparison.Ordinal) + "\"" }.Concat(data)),
            "\uFEFF" + csv,
            "\uFEFF\uFEFF" + csv,
            Join(lines.Take(1).Append("\uFEFF" + last)),
            csv.Replace(',', ';'),
            csv.Replace(',', '\t'),
            csv.Replace(',', '|'),
            csv.Replace(",", ", ", StringComparison.Ordinal),
            "",
            "\n",
            "\n\n\n",
            header,
            header + "\n",
            ",",
            "\"",
            Join(new[] { header + "," + header[(header.LastIndexOf(',') + 1)..] }.Concat(data.Select(d => d + ",1"))),
            Join(new[] { header.Replace(header[(header.LastIndexOf(',') + 1)..], "", StringComparison.Ordinal) }.Concat(data)),
            csv.Replace("\n", "\r\n", StringComparison.Ordinal),
            csv.Replace("\n", "\r", StringComparison.Ordinal),
            csv.Replace("\n", "\n\n", StringComparison.Ordinal),
            csv + "\u0000",
            Join(lines.Append(last + new string('9', 100_000))),
            Join(lines.Append(new string('x', 100_000))),
        ];
        foreach (var body in shapes)
        {
            yield return Csv("csv-shape", body);
        }

        foreach (var number in new[] { "1e308", "1.8e308", "-0", "1e-320", "4.9e-324", "1e99999", "NaN", "Infinity", "-Infinity", "", " ", "abc", "\"1,5\"", "0x10", "1_000", "٣" })
        {
            var cells = last.Split(',');
            cells[random.Next(1, cells.Length)] = number;
            yield return Csv("csv-number", Join(lines.SkipLast(1).Append(string.Join(",", cells))));
        }

        foreach (var rows in new[] { Math.Min(limits.MaxRows, 5_000), limits.MaxRows + 1 })
        {
            yield return Csv("csv-large", Join(lines.Concat(Enumerable.Repeat(last, rows - data.Length))));
        }

        var wide = string.Join(",", Enumerable.Range(0, limits.MaxParts + 2).Select(i => "p" + i.ToString(CultureInfo.InvariantCulture)));
        yield return Csv("csv-large", Join([wide, string.Join(",", Enumerable.Range(0, limits.MaxParts + 2).Select(i => "1"))]));

        foreach (var type in new[] { "text/plain", "application/json", "text/csv; charset=utf-16", "text/tab-separated-values", "text/csv; header=absent" })
        {
            yield return Csv("content-type", csv, type);
        }
    }

    /// <summary>Properties removed, unknown ones added, names duplicated, the root wrapped, arrays emptied.</summary>
    private static IEnumerable<string> ShapeChanges(string json, Random random)
    {
        var root = JsonNode.Parse(json)!.AsObject();
        foreach (var name in root.Select(p => p.Key).ToArray())
        {
            var without = JsonNode.Parse(json)!.AsObject();
            without.Remove(name);
            yield return without.ToJsonString();
            yield return json.Insert(1, $"\"{name}\": null, ");
            yield return json.Insert(1, $"\"{name.ToUpperInvariant()}\": 1, ");
        }

        yield return json.Insert(1, "\"unknownMember\": {\"deep\": [1, 2, 3]}, ");
        yield return "[" + json + "]";
        yield return "{\"body\": " + json + "}";
        yield return json.Replace("[", "{", StringComparison.Ordinal).Replace("]", "}", StringComparison.Ordinal);
        var nodes = Nodes(JsonNode.Parse(json)!);
        for (var i = 0; i < 6; i++)
        {
            yield return ReplaceNode(json, random.Next(nodes.Count), "[]");
        }
    }

    /// <summary>
    /// The largest array of the example at the row limit (bounded at 5,000 so the suite stays quick) and one over it;
    /// a table one part wider than the part limit; a screening batch at and over its limit; a body one byte over the
    /// body limit.
    /// </summary>
    private IEnumerable<string> LargeJson(string json)
    {
        var root = JsonNode.Parse(json)!.AsObject();
        var largest = Nodes(root).Select((n, i) => (Node: n, Index: i)).Where(x => x.Node is JsonArray { Count: > 0 })
            .OrderByDescending(x => ((JsonArray)x.Node!).Count).FirstOrDefault();
        if (largest.Node is JsonArray array)
        {
            var element = array[0]!.ToJsonString();
            foreach (var count in new[] { Math.Min(limits.MaxRows, 5_000), limits.MaxRows + 1 })
            {
                yield return ReplaceNode(json, largest.Index, "[" + string.Join(",", Enumerable.Repeat(element, count)) + "]");
            }
        }

        if (root["parts"] is JsonArray && root["rows"] is JsonArray)
        {
            var wide = limits.MaxParts + 1;
            var table = JsonNode.Parse(json)!.AsObject();
            table["parts"] = new JsonArray([.. Enumerable.Range(0, wide).Select(i => (JsonNode)("p" + i.ToString(CultureInfo.InvariantCulture)))]);
            table["rows"] = new JsonArray(new JsonArray([.. Enumerable.Range(0, wide).Select(i => (JsonNode)(1.0 + i))]));
            table.Remove("ids");
            yield return table.ToJsonString();
        }

        if (root["sample"] is JsonObject sample)
        {
            foreach (var count in new[] { limits.MaxScreeningSamples, limits.MaxScreeningSamples + 1 })
            {
                var batch = JsonNode.Parse(json)!.AsObject();
                batch.Remove("sample");
                var samples = new JsonArray();
                for (var i = 0; i < count; i++)
                {
                    var copy = sample.DeepClone().AsObject();
                    copy["id"] = $"hostile-batch-{count}-{i}";
                    samples.Add(copy);
                }

                batch["samples"] = samples;
                yield return batch.ToJsonString();
            }
        }

        yield return json + new string(' ', (int)Math.Min(limits.MaxBodyBytes + 1 - json.Length, 64L * 1024 * 1024));
    }

    private static HostileCase Make(HostileRoute route, string family, string method, string target, string? body, string? contentType) =>
        MakeBytes(route, family, method, target, body is null ? null : Encoding.UTF8.GetBytes(body), contentType);

    private static HostileCase MakeBytes(HostileRoute route, string family, string method, string target, byte[]? body, string? contentType) =>
        new(route.Key, family, method, target, body, contentType, []);

    /// <summary>The example with its <paramref name="index"/>-th node (document order, root excluded) replaced by raw text.</summary>
    private static string ReplaceNode(string json, int index, string raw)
    {
        var root = JsonNode.Parse(json)!;
        var node = Nodes(root)[index];
        var parent = node?.Parent;
        switch (parent)
        {
            case JsonObject o:
                o[node!.GetPropertyName()] = Placeholder;
                break;
            case JsonArray a:
                a[node!.GetElementIndex()] = Placeholder;
                break;
            default:
                return raw;
        }

        return root.ToJsonString().Replace("\"" + Placeholder + "\"", raw, StringComparison.Ordinal);
    }

    /// <summary>Every node below the root in document order (null values are skipped: they cannot name their parent).</summary>
    private static List<JsonNode?> Nodes(JsonNode root)
    {
        var list = new List<JsonNode?>();
        void Walk(JsonNode node)
        {
            IEnumerable<JsonNode?> children = node switch
            {
                JsonObject o => o.Select(p => p.Value),
                JsonArray a => a,
                _ => [],
            };
            foreach (var child in children.Where(c => c is not null))
            {
                list.Add(child);
                Walk(child!);
            }
        }

        Walk(root);
        return list;
    }

    private static string Edit(string text, string alphabet, Random random, int edits)
    {
        var s = new StringBuilder(text);
        for (var e = 0; e < edits && s.Length > 0; e++)
        {
            var at = random.Next(s.Length);
            switch (random.Next(3))
            {
                case 0:
                    s.Remove(at, 1);
                    break;
                case 1:
                    s.Insert(at, alphabet[random.Next(alphabet.Length)]);
                    break;
                default:
                    s[at] = alphabet[random.Next(alphabet.Length)];
                    break;
            }
        }

        return s.ToString();
    }

    private static IEnumerable<byte[]> RandomBytes(Random random, int count)
    {
        for (var i = 0; i < count; i++)
        {
            var bytes = new byte[random.Next(0, 400)];
            random.NextBytes(bytes);
            yield return bytes;
        }
    }

    private static IEnumerable<string> Pick(string[] values, int count, Random random) =>
        values.OrderBy(_ => random.Next()).Take(count).ToArray();

    private static string ReplaceParameters(string template, string value)
    {
        var s = new StringBuilder();
        for (var i = 0; i < template.Length; i++)
        {
            if (template[i] == '{')
            {
                i = template.IndexOf('}', i);
                s.Append(value);
            }
            else
            {
                s.Append(template[i]);
            }
        }

        return s.ToString();
    }

    /// <summary>FNV-1a of the text: string.GetHashCode differs between processes, which would unseed the cases.</summary>
    private static int StableHash(string text)
    {
        var hash = 2166136261u;
        foreach (var c in text)
        {
            hash = (hash ^ c) * 16777619u;
        }

        return (int)hash;
    }
}
