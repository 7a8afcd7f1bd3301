using System.Text;
using System.Text.Json;
using Partwise.Core.Tables;
using Partwise.Demo;

namespace Partwise.Core.Tests.Demo;

public class DemoFilesTests
{
    [Fact]
    public void CommittedDemoFilesAreExactlyWhatTheGeneratorWrites()
    {
        var committed = Path.Combine(RepositoryRoot(), "demo");
        if (Environment.GetEnvironmentVariable("PARTWISE_WRITE_DEMO") == "1")
        {
            // Regeneration on purpose: PARTWISE_WRITE_DEMO=1 dotnet test --filter CommittedDemoFiles
            DemoFiles.WriteAll(committed);
        }

        var fresh = Path.Combine(Path.GetTempPath(), "partwise-demo-" + Guid.NewGuid().ToString("N"));
        try
        {
            var written = DemoFiles.WriteAll(fresh).Select(Path.GetFileName).Order(StringComparer.Ordinal).ToArray();
            Assert.True(Directory.Exists(committed), $"{committed} is missing; regenerate with PARTWISE_WRITE_DEMO=1");
            var present = Directory.GetFiles(committed).Select(Path.GetFileName).Order(StringComparer.Ordinal).ToArray();
            Assert.Equal(written, present);
            foreach (var name in written)
            {
                var expected = File.ReadAllBytes(Path.Combine(fresh, name!));
                var actual = File.ReadAllBytes(Path.Combine(committed, name!));
                Assert.True(expected.AsSpan().SequenceEqual(actual), $"demo/{name} differs from the generator's output; regenerate with PARTWISE_WRITE_DEMO=1");
            }
        }
        finally
        {
            Directory.Delete(fresh, recursive: true);
        }
    }

    [Fact]
    public void TableBodiesAreValidTablesWithTheDemoZeroPolicy()
    {
        var files = DemoFiles.Build(GroundwaterScenario.Create(GroundwaterScenario.DemoSeed)).Where(f => f.Name.EndsWith(".json", StringComparison.Ordinal) && !f.Name.Contains("screenings", StringComparison.Ordinal));
        foreach (var file in files)
        {
            using var doc = JsonDocument.Parse(file.Content);
            var root = doc.RootElement;
            var parts = root.GetProperty("parts").EnumerateArray().Select(p => p.GetString()!).ToArray();
            var rows = root.GetProperty("rows").EnumerateArray().Select(r => r.EnumerateArray().Select(v => v.GetDouble()).ToArray()).ToArray();
            var ids = root.GetProperty("ids").EnumerateArray().Select(p => p.GetString()!).ToArray();
            var table = CompositionTable.FromRows(parts, rows, ids); // the Core's validation of the contract's Table shape
            Assert.Equal(GroundwaterScenario.Parts, table.Parts);
            Assert.Equal("multiplicative", root.GetProperty("zeros").GetProperty("method").GetString());
            var limits = root.GetProperty("zeros").GetProperty("detectionLimits");
            Assert.All(parts, p => Assert.True(limits.GetProperty(p).GetDouble() > 0));
        }
    }

    [Fact]
    public void CsvFilesHaveAnIdColumnAndOneLinePerSample()
    {
        var scenario = GroundwaterScenario.Create(GroundwaterScenario.DemoSeed);
        var csv = DemoFiles.TableCsv(scenario.Baseline);
        var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("id,Ca,Mg,Na,K,HCO3,Cl,SO4,NO3", lines[0]);
        Assert.Equal(scenario.Baseline.Count + 1, lines.Length);
        Assert.Equal(scenario.Baseline[0].Id, lines[1].Split(',')[0]);
        Assert.Equal(scenario.Baseline[0].Values, lines[1].Split(',').Skip(1).Select(v => double.Parse(v, System.Globalization.CultureInfo.InvariantCulture)));
    }

    [Fact]
    public void ScreeningBodyNamesEveryPartOfEverySample()
    {
        var drift = GroundwaterScenario.Create(GroundwaterScenario.DemoSeed).OfWell(GroundwaterScenario.DriftingWell, MonitoringPeriod.Later);
        using var doc = JsonDocument.Parse(DemoFiles.ScreeningsJson(drift));
        var samples = doc.RootElement.GetProperty("samples").EnumerateArray().ToArray();
        Assert.Equal(drift.Count, samples.Length);
        Assert.Equal(drift[^1].ValueOf("Cl"), samples[^1].GetProperty("values").GetProperty("Cl").GetDouble());
        Assert.Equal(drift[0].ObservedAt, DateTimeOffset.Parse(samples[0].GetProperty("observedAt").GetString()!, System.Globalization.CultureInfo.InvariantCulture));
    }

    private static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "service.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException($"No service.sln above {AppContext.BaseDirectory}.");
    }
}
