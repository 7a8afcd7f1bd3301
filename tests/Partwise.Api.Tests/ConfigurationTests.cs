using Microsoft.AspNetCore.Builder;
using Microsoft.Extensions.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;
using Partwise.Api.Baselines;
using Partwise.Api.Infrastructure;
using Partwise.Api.Tests.Support;
using Partwise.Storage;

namespace Partwise.Api.Tests;

/// <summary>
/// Every setting is checked at start: a bad value stops the service with a message that names the setting. For the
/// option classes the host is started (it must fail) and the start-up validation of the same registrations is run
/// on its own to read the message, since what the test host throws while it tears a failed host down varies.
/// </summary>
public class ConfigurationTests
{
    [Theory]
    [InlineData("Partwise:Limits:MaxScreeningSamples", "0")]
    [InlineData("Partwise:Limits:MaxBodyBytes", "100")]
    [InlineData("Partwise:Limits:MaxRows", "many")]
    public void ABadLimitStopsTheStartNamingIt(string setting, string value) =>
        Assert.Contains(setting, StartFailure(setting, value), StringComparison.Ordinal);

    [Theory]
    [InlineData("Partwise:Storage:DataDirectory", " ")]
    [InlineData("Partwise:Storage:ChangePollInterval", "00:01:00")]
    [InlineData("Partwise:Storage:ChangePollInterval", "soon")]
    public void ABadStorageSettingStopsTheStartNamingIt(string setting, string value) =>
        Assert.Contains(setting, StartFailure(setting, value), StringComparison.Ordinal);

    [Fact]
    public void AMalformedConnectionStringStopsTheStartNamingItButNotItsText()
    {
        var message = StartFailure("Partwise:Storage:PostgresConnectionString", "Host=db;Password=pw-9f2c;Colour=blue");
        Assert.Contains("Partwise:Storage:PostgresConnectionString", message, StringComparison.Ordinal);
        Assert.DoesNotContain("pw-9f2c", message, StringComparison.Ordinal);
    }

    [Fact]
    public void ADemoSwitchThatIsNotABooleanStopsTheStartNamingIt() =>
        Assert.Contains("Partwise:Demo:Enabled", StartFailure("Partwise:Demo:Enabled", "maybe"), StringComparison.Ordinal);

    [Theory]
    [InlineData("Serilog:MinimumLevel", "Loud")]
    [InlineData("Serilog:MinimumLevel:Default", "Chatty")]
    [InlineData("Serilog:MinimumLevel:Override:Microsoft.AspNetCore", "7")]
    public void ABadLogLevelStopsTheStartNamingIt(string setting, string value)
    {
        var builder = WebApplication.CreateBuilder(["--" + setting, value]);
        var error = Assert.Throws<InvalidOperationException>(() => builder.AddPartwiseLogging());
        Assert.Contains(setting, error.Message, StringComparison.Ordinal);
        Assert.Contains(value, error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void GoodLogLevelsPass()
    {
        var builder = WebApplication.CreateBuilder(["--Serilog:MinimumLevel:Default", "debug", "--Serilog:MinimumLevel:Override:Partwise", "Warning"]);
        builder.AddPartwiseLogging();
        Assert.Empty(RequestLogging.LevelProblems(builder.Configuration));
    }

    [Theory]
    [InlineData("urls", "127.0.0.1:5080")]
    [InlineData("urls", "http://127.0.0.1:5080;tcp//0.0.0.0")]
    [InlineData("http_ports", "eighty")]
    [InlineData("https_ports", "70000")]
    public void ABadListenAddressStopsTheStartNamingIt(string setting, string value)
    {
        var builder = WebApplication.CreateBuilder(["--" + setting, value]);
        var error = Assert.Throws<InvalidOperationException>(() => builder.UseDefaultListenAddress());
        Assert.StartsWith(setting + " ", error.Message, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("urls", "http://0.0.0.0:8080;http://127.0.0.1:5081")]
    [InlineData("urls", "http://+:80")]
    [InlineData("http_ports", "8080;8081")]
    public void GoodListenAddressesPass(string setting, string value) =>
        Assert.Empty(ListenAddress.Problems(new ConfigurationBuilder().AddInMemoryCollection([new(setting, value)]).Build()));

    [Fact]
    public void AppSettingsHoldTheDefaultsOfTheCode()
    {
        // appsettings.json shows an operator every setting with its value; it must not disagree with the defaults in code.
        var root = Path.GetDirectoryName(Path.GetDirectoryName(OpenApiTests.CommittedPath()))!;
        var configuration = new ConfigurationBuilder().AddJsonFile(Path.Combine(root, "src", "Partwise.Api", "appsettings.json")).Build();
        AssertSameProperties(new LimitsOptions(), configuration.GetSection(LimitsOptions.Section).Get<LimitsOptions>()!);
        AssertSameProperties(new StorageOptions(), configuration.GetSection(StorageSetup.Section).Get<StorageOptions>()!);
        Assert.Empty(RequestLogging.LevelProblems(configuration));
    }

    /// <summary>
    /// The message with which the host refuses to start with <paramref name="setting"/> set to <paramref name="value"/>:
    /// the real host must fail to start, and the start-up validation of the same registrations gives the message.
    /// </summary>
    private static string StartFailure(string setting, string value)
    {
        using (var factory = PartwiseFactory.WithSettings((setting, value)))
        {
            Assert.ThrowsAny<Exception>(() => factory.CreateClient());
        }

        var configuration = new ConfigurationBuilder().AddInMemoryCollection([new(setting, value)]).Build();
        var services = new ServiceCollection().AddLogging();
        services.AddPartwiseLimits(configuration).AddPartwiseStorage(configuration).AddPartwiseBaselines(configuration);
        using var provider = services.BuildServiceProvider();
        var error = Assert.ThrowsAny<Exception>(() => provider.GetRequiredService<IStartupValidator>().Validate());
        return error is AggregateException aggregate ? string.Join(" ", aggregate.InnerExceptions.Select(e => e.Message)) : error.Message;
    }

    private static void AssertSameProperties<T>(T expected, T actual)
    {
        foreach (var property in typeof(T).GetProperties().Where(p => p.CanWrite))
        {
            Assert.True(Equals(property.GetValue(expected), property.GetValue(actual)), $"{typeof(T).Name}.{property.Name}: appsettings.json has {property.GetValue(actual)}, the code {property.GetValue(expected)}");
        }
    }
}
