using System.Globalization;
using System.Text;

namespace Partwise.Api.Tests.Support;

/// <summary>
/// One sample of a scrape in the Prometheus text exposition format (version 0.0.4, prometheus.io
/// "Exposition formats"): a metric name, its labels and a value.
/// </summary>
public sealed record MetricSample(string Name, IReadOnlyDictionary<string, string> Labels, double Value);

/// <summary>A parsed scrape of <c>/metrics</c>, with the sum of the samples that match a name and some labels.</summary>
public sealed class Exposition(IReadOnlyList<MetricSample> samples)
{
    /// <summary>Every sample of the scrape.</summary>
    public IReadOnlyList<MetricSample> Samples { get; } = samples;

    /// <summary>GETs <c>/metrics</c> and parses it.</summary>
    public static async Task<Exposition> Scrape(HttpClient client)
    {
        using var response = await client.GetAsync(new Uri("/metrics", UriKind.Relative));
        var text = await response.Content.ReadAsStringAsync();
        Assert.True(response.IsSuccessStatusCode, $"/metrics answered {(int)response.StatusCode}: {text}");
        Assert.Equal("text/plain", response.Content.Headers.ContentType?.MediaType);
        return Parse(text);
    }

    /// <summary>
    /// Parses the text format: <c># HELP</c> and <c># TYPE</c> lines are skipped; a sample line is
    /// <c>name{label="value",...} value [timestamp]</c>, where a label value escapes <c>\\</c>, <c>\"</c> and <c>\n</c>.
    /// </summary>
    public static Exposition Parse(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var samples = new List<MetricSample>();
        foreach (var raw in text.Split('\n'))
        {
            var line = raw.TrimEnd('\r');
            if (line.Length == 0 || line[0] == '#')
            {
                continue;
            }

            var i = 0;
            while (i < line.Length && line[i] != '{' && line[i] != ' ')
            {
                i++;
            }

            var name = line[..i];
            var labels = new Dictionary<string, string>(StringComparer.Ordinal);
            if (i < line.Length && line[i] == '{')
            {
                i++;
                while (line[i] != '}')
                {
                    var eq = line.IndexOf('=', i);
                    var label = line[i..eq];
                    Assert.Equal('"', line[eq + 1]);
                    var value = new StringBuilder();
                    i = eq + 2;
                    for (; line[i] != '"'; i++)
                    {
                        if (line[i] == '\\')
                        {
                            i++;
                            value.Append(line[i] == 'n' ? '\n' : line[i]);
                        }
                        else
                        {
                            value.Append(line[i]);
                        }
                    }

                    labels[label] = value.ToString();
                    i++;
                    if (line[i] == ',')
                    {
                        i++;
                    }
                }

                i++;
            }

            var fields = line[i..].Split(' ', StringSplitOptions.RemoveEmptyEntries);
            samples.Add(new MetricSample(name, labels, ParseValue(fields[0])));
        }

        return new Exposition(samples);
    }

    /// <summary>
    /// The sum of the samples named <paramref name="name"/> whose labels include every one given (other labels any);
    /// 0 when none matches, as a counter that has not moved yet has no sample.
    /// </summary>
    public double Sum(string name, params (string Label, string Value)[] labels) =>
        Samples.Where(s => s.Name == name && labels.All(l => s.Labels.TryGetValue(l.Label, out var v) && v == l.Value)).Sum(s => s.Value);

    private static double ParseValue(string text) => text switch
    {
        "+Inf" => double.PositiveInfinity,
        "-Inf" => double.NegativeInfinity,
        "NaN" => double.NaN,
        _ => double.Parse(text, NumberStyles.Float, CultureInfo.InvariantCulture),
    };
}
