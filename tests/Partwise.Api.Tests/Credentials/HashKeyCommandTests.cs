using System.Diagnostics;
using System.Text.RegularExpressions;
using Partwise.Api.Credentials;
using Partwise.Api.Tests.Support;

namespace Partwise.Api.Tests.Credentials;

public partial class HashKeyCommandTests
{
    private static (int Code, string Output, string Error) Run(string[] args, string input = "")
    {
        using var stdin = new StringReader(input);
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        var code = HashKeyCommand.Run(args, stdin, stdout, stderr);
        return (code, stdout.ToString(), stderr.ToString());
    }

    [Fact]
    public void ANewKeyIs32RandomBytesInBase64UrlWithItsHash()
    {
        var (code, output, _) = Run([]);
        Assert.Equal(0, code);
        var key = KeyLine().Match(output).Groups[1].Value;
        // 32 bytes in base64url without padding (RFC 4648 §5) are 43 characters of A-Z a-z 0-9 - _.
        Assert.Matches("^[A-Za-z0-9_-]{43}$", key);
        Assert.Equal(32, Convert.FromBase64String(key.Replace('-', '+').Replace('_', '/') + "=").Length);
        Assert.Equal(CredentialHosts.Sha256Hex(key), HashLine().Match(output).Groups[1].Value);

        var (_, second, _) = Run([]);
        Assert.NotEqual(key, KeyLine().Match(second).Groups[1].Value);
    }

    [Fact]
    public void AGivenKeyIsHashedAndNotRepeated()
    {
        var (code, output, error) = Run(["abc"]);
        Assert.Equal(0, code);
        // FIPS 180-2, Appendix B.1.
        Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", HashLine().Match(output).Groups[1].Value);
        Assert.DoesNotMatch(KeyLine(), output);
        Assert.Contains("shorter than 22 characters", error, StringComparison.Ordinal);
        Assert.Contains("Partwise__Credentials__Keys__0__Sha256=ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", output, StringComparison.Ordinal);
        Assert.Contains("\"Sha256\": \"ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad\"", output, StringComparison.Ordinal);
    }

    [Fact]
    public void ADashReadsTheKeyFromStandardInput()
    {
        var (code, output, _) = Run(["-"], "abc\n");
        Assert.Equal(0, code);
        Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", HashLine().Match(output).Groups[1].Value);
    }

    [Theory]
    [InlineData("one", "two")]
    [InlineData("--name")]
    [InlineData("has space")]
    [InlineData("quote\"d")]
    public void BadArgumentsAreAUsageErrorWithExitCode2(params string[] args)
    {
        var (code, output, error) = Run(args);
        Assert.Equal(2, code);
        Assert.Equal("", output);
        Assert.NotEqual("", error);
    }

    [Fact]
    public void OtherArgumentsStartTheService()
    {
        Assert.False(HashKeyCommand.TryRun([]));
        Assert.False(HashKeyCommand.TryRun(["--urls", "http://127.0.0.1:5310"]));
    }

    [Fact]
    public async Task ThePrintedEnvironmentLinesConfigureAKeyTheServiceAccepts()
    {
        var (_, output, _) = Run([]);
        var key = KeyLine().Match(output).Groups[1].Value;
        // The environment provider reads "__" as ":" (ASP.NET Core configuration); the role printed is submitter.
        var settings = EnvLine().Matches(output).Select(m => (m.Groups[1].Value.Replace("__", ":", StringComparison.Ordinal), (string?)m.Groups[2].Value)).ToArray();
        Assert.Equal(3, settings.Length);
        await using var factory = PartwiseFactory.WithSettings(settings);
        factory.RemoteAddress = CredentialHosts.Remote;
        using var client = CredentialHosts.Client(factory, key);
        using var screening = await client.PostJson("/v1/baselines/no-such-id/screenings", "{}");
        Assert.True((int)screening.StatusCode is not (401 or 403), $"{(int)screening.StatusCode}");
        using var flags = await client.GetAsync(new Uri("/v1/flags", UriKind.Relative));
        await flags.Problem(403, "/problems/forbidden");
    }

    [Fact]
    public async Task TheCommandLinePrintsAndExitsWithoutStartingTheService()
    {
        // The service's own build output beside this test's: tests/Partwise.Api.Tests/bin/<c>/<tfm> → src/Partwise.Api/bin/<c>/<tfm>.
        var here = new DirectoryInfo(AppContext.BaseDirectory);
        var tfm = here.Name;
        var configuration = here.Parent!.Name;
        var root = Path.GetDirectoryName(Path.GetDirectoryName(OpenApiTests.CommittedPath()))!;
        var dll = Path.Combine(root, "src", "Partwise.Api", "bin", configuration, tfm, "Partwise.Api.dll");
        Assert.True(File.Exists(dll), "not built: " + dll);
        var data = Path.Combine(Path.GetTempPath(), "partwise-hash-key-" + Guid.NewGuid().ToString("N"));

        var start = new ProcessStartInfo(Environment.GetEnvironmentVariable("DOTNET_HOST_PATH") ?? "dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        start.ArgumentList.Add(dll);
        start.ArgumentList.Add("hash-key");
        start.ArgumentList.Add("abc");
        start.Environment["Partwise__Storage__DataDirectory"] = data;
        start.Environment["ASPNETCORE_URLS"] = "http://127.0.0.1:5319";
        using var process = Process.Start(start)!;
        var output = process.StandardOutput.ReadToEndAsync();
        var error = process.StandardError.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(60));
        try
        {
            // A started service would listen until stopped: exiting at all shows that it did not start.
            await process.WaitForExitAsync(timeout.Token);
        }
        catch (OperationCanceledException)
        {
            process.Kill(entireProcessTree: true);
            Assert.Fail("hash-key did not exit within 60 s; did the service start?");
        }

        Assert.Equal(0, process.ExitCode);
        var text = await output;
        Assert.Contains("sha256: ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", text, StringComparison.Ordinal);
        Assert.DoesNotContain("Now listening", text, StringComparison.Ordinal);
        Assert.Contains("shorter than 22", await error, StringComparison.Ordinal);
        Assert.False(Directory.Exists(data), "hash-key created the data directory");
    }

    [GeneratedRegex(@"^key:\s+(\S+)$", RegexOptions.Multiline)]
    private static partial Regex KeyLine();

    [GeneratedRegex(@"^sha256:\s+([0-9a-f]{64})$", RegexOptions.Multiline)]
    private static partial Regex HashLine();

    [GeneratedRegex(@"^\s+(Partwise__Credentials__\S+)=(\S+)$", RegexOptions.Multiline)]
    private static partial Regex EnvLine();
}
