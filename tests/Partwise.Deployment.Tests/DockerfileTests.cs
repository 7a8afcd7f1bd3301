using System.Globalization;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.Extensions.Configuration;
using Partwise.Api.Health;
using Partwise.Api.Infrastructure;
using Partwise.Deployment.Tests.Support;
using Partwise.Storage;

namespace Partwise.Deployment.Tests;

/// <summary>The Dockerfile, read as text (no container engine runs here): its stages, user, port, health check and data directory.</summary>
public class DockerfileTests
{
    private static readonly IReadOnlyList<DockerStage> Stages = Dockerfile.Stages();

    private static DockerStage Build => Stages[0];

    private static DockerStage Final => Stages[^1];

    private static string ApiDll => typeof(HealthProbe).Assembly.GetName().Name + ".dll";

    [Fact]
    public void ItBuildsOnTheSdkAndRunsOnTheAspNetRuntimeInSeparateStages()
    {
        Assert.True(Stages.Count >= 2, $"expected a build stage and a runtime stage, found {Stages.Count}");
        Assert.Equal("mcr.microsoft.com/dotnet/sdk:10.0", Build.Image);
        Assert.Equal("mcr.microsoft.com/dotnet/aspnet:10.0", Final.Image);
        Assert.NotNull(Build.Name);
        // The runtime stage takes the published output of the build stage and nothing of the SDK.
        var copy = Assert.Single(Final.All("COPY"));
        Assert.Equal(["--from=" + Build.Name, "/app", "./"], copy.Words);
        Assert.Equal("/app", Final.Last("WORKDIR").Arguments);
    }

    [Fact]
    public void TheBuildStagePublishesTheApiFrameworkDependentForLinuxX64IntoApp()
    {
        var publish = Assert.Single(Build.All("RUN"), r => r.Arguments.StartsWith("dotnet publish ", StringComparison.Ordinal));
        var words = publish.Words;
        Assert.Equal("src/Partwise.Api", words[2]);
        Assert.Equal("Release", After(words, "-c"));
        Assert.Equal("linux-x64", After(words, "-r"));
        Assert.Equal("false", After(words, "--self-contained"));
        Assert.Equal("/app", After(words, "-o"));
        // A publish without restore needs the restore of the same runtime identifier before it.
        if (words.Contains("--no-restore"))
        {
            var restore = Assert.Single(Build.All("RUN"), r => r.Arguments.StartsWith("dotnet restore ", StringComparison.Ordinal));
            Assert.True(restore.Line < publish.Line, "dotnet restore runs after dotnet publish");
            Assert.Equal("src/Partwise.Api", restore.Words[2]);
            Assert.Equal("linux-x64", After(restore.Words, "-r"));
        }
    }

    [Fact]
    public void TheFinalStageRunsAsANumericNonRootUserWhoOwnsTheDataDirectory()
    {
        var (uid, gid) = User();
        Assert.NotEqual(0, uid);
        Assert.NotEqual(0, gid);
        Assert.Contains(Final.All("RUN"), r => r.Arguments.Contains($"chown {uid}:{gid} /data", StringComparison.Ordinal));
        // USER comes after every RUN, so nothing of the final image's setup is left to a root step later.
        Assert.True(Final.Last("USER").Line > Final.All("RUN").Max(r => r.Line));
    }

    [Fact]
    public void TheDataDirectoryIsSlashDataAndAVolume()
    {
        var environment = Final.Environment();
        Assert.Equal("/data", environment["Partwise__Storage__DataDirectory"]);
        // The variable binds the app's real setting (no misspelt name that the host would ignore).
        Assert.Empty(AppSettings.Problems(environment.Where(e => e.Key.StartsWith("Partwise__", StringComparison.Ordinal)).ToDictionary()));
        Assert.Equal("/data", AppSettings.Bound(environment, typeof(StorageOptions), nameof(StorageOptions.DataDirectory)));
        Assert.Contains("/data", Final.Last("VOLUME").ExecForm());
    }

    [Fact]
    public void TheContainerListensOnAllInterfacesOnTheExposedPort()
    {
        var environment = Final.Environment();
        var url = new Uri(environment["ASPNETCORE_URLS"]);
        Assert.Equal("0.0.0.0", url.Host);
        Assert.Equal(ExposedPort(), url.Port);
        // The image's own ASPNETCORE_HTTP_PORTS is cleared, so no second address competes with ASPNETCORE_URLS.
        Assert.Equal("", environment["ASPNETCORE_HTTP_PORTS"]);

        // The app's listen-address rule (ListenAddress.UseDefaultListenAddress) keeps a configured address and only
        // falls back to loopback without one: the image's variables, as the host reads ASPNETCORE_* variables.
        Assert.Equal(environment["ASPNETCORE_URLS"], ListenUrlsWith(("urls", environment["ASPNETCORE_URLS"]), ("http_ports", environment["ASPNETCORE_HTTP_PORTS"])));
        Assert.Equal(ListenAddress.Default, ListenUrlsWith());
    }

    [Fact]
    public void TheHealthCheckRunsTheAppsProbeAgainstHealthzOnTheListeningPort()
    {
        var healthcheck = Final.Last("HEALTHCHECK");
        Assert.Contains(" CMD [", " " + healthcheck.Arguments, StringComparison.Ordinal);
        var command = healthcheck.ExecForm();
        Assert.Equal(["dotnet", "/app/" + ApiDll, HealthProbe.Command], command[..3]);
        Assert.Equal(4, command.Length);
        var url = new Uri(command[3]);
        Assert.Equal("127.0.0.1", url.Host);
        Assert.Equal(ExposedPort(), url.Port);
        Assert.Equal("/healthz", url.AbsolutePath);
        Assert.True(Routes.HasGet(url.AbsolutePath), $"GET {url.AbsolutePath} is not a route of openapi/partwise.v1.json");
        // The probe's timeout (HealthProbe.DefaultTimeout) fits inside the engine's.
        var timeout = healthcheck.Words.Single(w => w.StartsWith("--timeout=", StringComparison.Ordinal));
        Assert.True(HealthProbe.DefaultTimeout < TimeSpan.FromSeconds(int.Parse(timeout["--timeout=".Length..^1], CultureInfo.InvariantCulture)));
    }

    [Fact]
    public void TheEntryPointStartsThePublishedApi() =>
        Assert.Equal(["dotnet", "/app/" + ApiDll], Final.Last("ENTRYPOINT").ExecForm());

    [Fact]
    public void TheBuildContextLeavesOutBuildOutputGitTestsAndData()
    {
        var ignored = Repository.Read(".dockerignore").Split('\n').Select(l => l.Trim()).Where(l => l.Length > 0 && !l.StartsWith('#')).ToHashSet(StringComparer.Ordinal);
        foreach (var pattern in new[] { "**/bin/", "**/obj/", ".git/", "tests/", "data/", "**/data/", "TestResults/" })
        {
            Assert.Contains(pattern, ignored);
        }

        // What the build stage copies is not ignored.
        foreach (var copy in Build.All("COPY"))
        {
            foreach (var source in copy.Words[..^1])
            {
                Assert.DoesNotContain(source, ignored);
                Assert.True(File.Exists(Repository.PathOf(source.TrimEnd('/'))) || Directory.Exists(Repository.PathOf(source.TrimEnd('/'))), $"COPY source {source} is not in the repository");
            }
        }
    }

    /// <summary>The numeric user and group of the final stage's USER.</summary>
    internal static (int Uid, int Gid) User()
    {
        var parts = Final.Last("USER").Arguments.Split(':');
        Assert.True(parts.Length == 2, "USER names a user and a group: uid:gid");
        Assert.True(int.TryParse(parts[0], NumberStyles.None, CultureInfo.InvariantCulture, out var uid), $"USER {parts[0]} is not numeric");
        Assert.True(int.TryParse(parts[1], NumberStyles.None, CultureInfo.InvariantCulture, out var gid), $"group {parts[1]} is not numeric");
        return (uid, gid);
    }

    /// <summary>The one port the final stage exposes.</summary>
    internal static int ExposedPort() =>
        int.Parse(Assert.Single(Final.All("EXPOSE")).Arguments.Split('/')[0], NumberStyles.None, CultureInfo.InvariantCulture);

    private static string After(string[] words, string option)
    {
        var i = Array.IndexOf(words, option);
        Assert.True(i >= 0 && i + 1 < words.Length, $"no {option} VALUE in: {string.Join(' ', words)}");
        return words[i + 1];
    }

    private static string? ListenUrlsWith(params (string Key, string Value)[] settings)
    {
        var builder = WebApplication.CreateEmptyBuilder(new WebApplicationOptions());
        builder.Configuration.AddInMemoryCollection(settings.Select(s => KeyValuePair.Create(s.Key, (string?)s.Value)));
        builder.UseDefaultListenAddress();
        return builder.WebHost.GetSetting(WebHostDefaults.ServerUrlsKey);
    }
}
