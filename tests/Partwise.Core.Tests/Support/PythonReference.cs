using System.Diagnostics;
using System.Text.Json;

namespace Partwise.Core.Tests.Support;

/// <summary>
/// Runs a reference computation in Debian's Python with numpy, scipy and scikit-learn: a script reads one JSON
/// document on stdin and writes one JSON document on stdout. Tests using it are marked <see cref="NeedsPythonFactAttribute"/>.
/// </summary>
public static class PythonReference
{
    /// <summary>The interpreter: PARTWISE_PYTHON, else Debian's /usr/bin/python3.</summary>
    public static string Interpreter => Environment.GetEnvironmentVariable("PARTWISE_PYTHON") is { Length: > 0 } p ? p : "/usr/bin/python3";

    /// <summary>Why Python with the given modules cannot run here, or null when it can.</summary>
    public static string? Unavailable(params string[] modules)
    {
        if (!File.Exists(Interpreter))
        {
            return $"{Interpreter} is not installed";
        }

        try
        {
            var result = RunRaw($"import {string.Join(", ", modules)}", "");
            return result.ExitCode == 0 ? null : $"python modules {string.Join(", ", modules)} are missing: {result.Error.Trim()}";
        }
        catch (Exception ex) when (ex is System.ComponentModel.Win32Exception or InvalidOperationException)
        {
            return ex.Message;
        }
    }

    /// <summary>Runs <paramref name="script"/> with <paramref name="input"/> serialised as JSON on stdin and parses its stdout.</summary>
    public static JsonElement Run(string script, object input)
    {
        var result = RunRaw(script, JsonSerializer.Serialize(input));
        if (result.ExitCode != 0)
        {
            Assert.Fail($"the Python reference failed ({result.ExitCode}): {result.Error}");
        }

        using var doc = JsonDocument.Parse(result.Output);
        return doc.RootElement.Clone();
    }

    private static (int ExitCode, string Output, string Error) RunRaw(string script, string stdin)
    {
        var info = new ProcessStartInfo(Interpreter)
        {
            RedirectStandardInput = true,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add("-c");
        info.ArgumentList.Add(script);
        using var process = Process.Start(info) ?? throw new InvalidOperationException("python did not start");
        var output = process.StandardOutput.ReadToEndAsync();
        var error = process.StandardError.ReadToEndAsync();
        process.StandardInput.Write(stdin);
        process.StandardInput.Close();
        process.WaitForExit();
        return (process.ExitCode, output.Result, error.Result);
    }
}

/// <summary>
/// A fact that needs Debian's Python with numpy and scipy (and scikit-learn). It skips, saying why, where they are
/// missing; with PARTWISE_REQUIRE_EXTERNAL=1 (set by .ci/run) it runs anyway, so a missing interpreter fails it.
/// </summary>
[AttributeUsage(AttributeTargets.Method)]
public sealed class NeedsPythonFactAttribute : FactAttribute
{
    /// <summary>Sets <see cref="FactAttribute.Skip"/> when the reference Python is not available.</summary>
    public NeedsPythonFactAttribute()
    {
        if (Environment.GetEnvironmentVariable("PARTWISE_REQUIRE_EXTERNAL") == "1")
        {
            return;
        }

        if (PythonReference.Unavailable("numpy", "scipy", "sklearn") is { } why)
        {
            Skip = $"needs Debian's python3-numpy, python3-scipy and python3-sklearn: {why}";
        }
    }
}
