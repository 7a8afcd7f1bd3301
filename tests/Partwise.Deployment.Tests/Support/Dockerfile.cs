using System.Text.Json;

namespace Partwise.Deployment.Tests.Support;

/// <summary>One instruction of a Dockerfile: its keyword in capitals and its arguments, continuation lines joined.</summary>
internal sealed record DockerInstruction(string Keyword, string Arguments, int Line)
{
    /// <summary>The arguments as whitespace-separated words.</summary>
    public string[] Words => Arguments.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);

    /// <summary>
    /// The JSON array of an exec form (<c>["dotnet", "x.dll"]</c>) that ends the arguments, after any
    /// <c>--option=value</c> words and a CMD keyword (HEALTHCHECK).
    /// </summary>
    public string[] ExecForm()
    {
        var start = Arguments.IndexOf('[', StringComparison.Ordinal);
        Assert.True(start >= 0, $"line {Line}: {Keyword} is not in exec form: {Arguments}");
        return JsonSerializer.Deserialize<string[]>(Arguments[start..]) ?? [];
    }
}

/// <summary>One build stage: its base image, its name (<c>AS name</c>) and its instructions.</summary>
internal sealed record DockerStage(string Image, string? Name, IReadOnlyList<DockerInstruction> Instructions)
{
    /// <summary>The instructions with a keyword.</summary>
    public IEnumerable<DockerInstruction> All(string keyword) =>
        Instructions.Where(i => string.Equals(i.Keyword, keyword, StringComparison.Ordinal));

    /// <summary>The last instruction with a keyword (the one in force), failing when there is none.</summary>
    public DockerInstruction Last(string keyword) =>
        All(keyword).LastOrDefault() ?? throw new Xunit.Sdk.XunitException($"stage {Name ?? Image} has no {keyword}");

    /// <summary>The variables that ENV sets in this stage (<c>KEY=value</c> pairs, or the older <c>KEY value</c>).</summary>
    public IReadOnlyDictionary<string, string> Environment()
    {
        var variables = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var env in All("ENV"))
        {
            var words = env.Words;
            if (words.Length > 0 && !words[0].Contains('=', StringComparison.Ordinal))
            {
                variables[words[0]] = string.Join(' ', words.Skip(1));
                continue;
            }

            foreach (var word in words)
            {
                var equals = word.IndexOf('=', StringComparison.Ordinal);
                Assert.True(equals > 0, $"line {env.Line}: ENV word without '=': {word}");
                variables[word[..equals]] = word[(equals + 1)..].Trim('"');
            }
        }

        return variables;
    }
}

/// <summary>
/// A small reader of the Dockerfile's syntax as far as this repository uses it: comments, continuation lines,
/// stages (FROM image AS name) and their instructions. No variable substitution (the file uses no ARG).
/// </summary>
internal static class Dockerfile
{
    /// <summary>The stages of the repository's Dockerfile, in order.</summary>
    public static IReadOnlyList<DockerStage> Stages() => Parse(Repository.Read("Dockerfile"));

    /// <summary>The stages of a Dockerfile's text, in order.</summary>
    public static IReadOnlyList<DockerStage> Parse(string text)
    {
        var stages = new List<DockerStage>();
        List<DockerInstruction>? current = null;
        foreach (var instruction in Instructions(text))
        {
            if (instruction.Keyword == "FROM")
            {
                var words = instruction.Words.Where(w => !w.StartsWith("--", StringComparison.Ordinal)).ToArray();
                var name = words.Length == 3 && string.Equals(words[1], "AS", StringComparison.OrdinalIgnoreCase) ? words[2] : null;
                current = [];
                stages.Add(new DockerStage(words[0], name, current));
                continue;
            }

            Assert.True(current is not null, $"line {instruction.Line}: {instruction.Keyword} before the first FROM");
            current!.Add(instruction);
        }

        return stages;
    }

    private static IEnumerable<DockerInstruction> Instructions(string text)
    {
        var lines = text.Replace("\r\n", "\n", StringComparison.Ordinal).Split('\n');
        var pending = new List<string>();
        var start = 0;
        for (var i = 0; i < lines.Length; i++)
        {
            var line = lines[i].Trim();
            // Comment lines are dropped, also between continuation lines (as the engine does).
            if (line.StartsWith('#') || (line.Length == 0 && pending.Count == 0))
            {
                continue;
            }

            if (pending.Count == 0)
            {
                start = i + 1;
            }

            var continues = line.EndsWith('\\');
            pending.Add(continues ? line[..^1].Trim() : line);
            if (continues)
            {
                continue;
            }

            var joined = string.Join(' ', pending.Where(p => p.Length > 0));
            pending.Clear();
            var space = joined.IndexOfAny([' ', '\t']);
            yield return space < 0
                ? new DockerInstruction(joined.ToUpperInvariant(), "", start)
                : new DockerInstruction(joined[..space].ToUpperInvariant(), joined[(space + 1)..].Trim(), start);
        }

        Assert.True(pending.Count == 0, "the Dockerfile ends inside a continuation line");
    }
}
