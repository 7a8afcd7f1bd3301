using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Baselines;

public class DemoBaselineTests
{
    [Fact]
    public async Task TheDemoBaselineIsLoadedAtStartAndFlagsTheDriftingWell()
    {
        await using var factory = PartwiseFactory.WithSettings(("Partwise:Demo:Enabled", "true"));
        using var client = factory.CreateClient();
        using var list = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
        var items = (await list.OkJson()).GetProperty("items");
        var demo = Assert.Single(items.EnumerateArray(), b => b.GetProperty("name").GetString() == "well-11 2025");
        var id = demo.GetProperty("id").GetString()!;
        Assert.Contains(factory.Logs.Events, e => e.Properties.TryGetValue("BaselineId", out var v) && v.ToString().Contains(id, StringComparison.Ordinal) && e.MessageTemplate.Text.StartsWith("Demo baseline", StringComparison.Ordinal));

        // The last 2026 sample of well-11 (demo/well-11-screenings.json): well mixed with the invented brine by then.
        var screenings = System.Text.Json.JsonDocument.Parse(await File.ReadAllTextAsync(Path.Combine(Path.GetDirectoryName(OpenApiTests.CommittedPath())!, "..", "demo", "well-11-screenings.json")));
        var last = screenings.RootElement.GetProperty("samples").EnumerateArray().Last().GetRawText();
        var result = (await BaselineBodies.Screen(client, id, "{\"sample\": " + last + "}")).GetProperty("results")[0];
        Assert.True(result.GetProperty("flagged").GetBoolean());
        var labels = result.GetProperty("reasons").EnumerateArray().Select(r => r.GetProperty("label").GetString()).ToArray();
        Assert.Contains(labels, l => l!.Contains("Cl", StringComparison.Ordinal) || l.Contains("Na", StringComparison.Ordinal));
        Assert.Equal("Cl/HCO3", result.GetProperty("ruleViolations")[0].GetProperty("label").GetString());
    }

    [Fact]
    public async Task ARestartOnTheSameStoreDoesNotLoadTheDemoBaselineAgain()
    {
        var directory = Path.Combine(Path.GetTempPath(), "partwise-demo-" + Guid.NewGuid().ToString("N"));
        try
        {
            string first;
            await using (var factory = PartwiseFactory.WithSettings(("Partwise:Demo:Enabled", "true"), ("Partwise:Storage:DataDirectory", directory)))
            {
                using var client = factory.CreateClient();
                using var list = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
                first = Assert.Single((await list.OkJson()).GetProperty("items").EnumerateArray()).GetProperty("id").GetString()!;
            }

            await using (var factory = PartwiseFactory.WithSettings(("Partwise:Demo:Enabled", "true"), ("Partwise:Storage:DataDirectory", directory)))
            {
                using var client = factory.CreateClient();
                using var list = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
                Assert.Equal(first, Assert.Single((await list.OkJson()).GetProperty("items").EnumerateArray()).GetProperty("id").GetString());
            }
        }
        finally
        {
            Directory.Delete(directory, recursive: true);
        }
    }

    [Fact]
    public async Task TheDemoBaselineIsOffInTestsByDefault()
    {
        await using var factory = new PartwiseFactory();
        using var client = factory.CreateClient();
        using var list = await client.GetAsync(new Uri("/v1/baselines", UriKind.Relative));
        Assert.Equal(0, (await list.OkJson()).GetProperty("items").GetArrayLength());
    }
}
