using System.Text.Json;

namespace Partwise.Api.Tests.Support;

/// <summary>The one place where numbers from responses are compared: |a − b| ≤ abs + rel·max(|a|, |b|).</summary>
public static class Tolerance
{
    /// <summary>Asserts two numbers agree within an absolute and a relative tolerance.</summary>
    public static void Close(double expected, double actual, double abs = 1e-12, double rel = 1e-12, string? what = null)
    {
        var bound = abs + (rel * Math.Max(Math.Abs(expected), Math.Abs(actual)));
        if (!(Math.Abs(expected - actual) <= bound))
        {
            Assert.Fail($"{what ?? "value"}: expected {expected:R}, got {actual:R} (|diff| {Math.Abs(expected - actual):E3} > {bound:E3})");
        }
    }

    /// <summary>Asserts two sequences of numbers agree element-wise.</summary>
    public static void Close(IReadOnlyList<double> expected, IReadOnlyList<double> actual, double abs = 1e-12, double rel = 1e-12, string? what = null)
    {
        Assert.Equal(expected.Count, actual.Count);
        for (var i = 0; i < expected.Count; i++)
        {
            Close(expected[i], actual[i], abs, rel, $"{what ?? "element"}[{i}]");
        }
    }

    /// <summary>Asserts a JSON array of numbers agrees element-wise with <paramref name="expected"/>.</summary>
    public static void Close(IReadOnlyList<double> expected, JsonElement actual, double abs = 1e-12, double rel = 1e-12, string? what = null)
    {
        Assert.Equal(expected.Count, actual.GetArrayLength());
        for (var i = 0; i < expected.Count; i++)
        {
            Close(expected[i], actual[i].GetDouble(), abs, rel, $"{what ?? "element"}[{i}]");
        }
    }

    /// <summary>Asserts a JSON matrix (array of row arrays) agrees element-wise with <paramref name="expected"/>.</summary>
    public static void Close(double[][] expected, JsonElement actual, double abs = 1e-12, double rel = 1e-12, string? what = null)
    {
        Assert.Equal(expected.Length, actual.GetArrayLength());
        for (var i = 0; i < expected.Length; i++)
        {
            Close(expected[i], actual[i], abs, rel, $"{what ?? "matrix"}[{i}]");
        }
    }
}
