namespace Partwise.Core.Tests.Support;

/// <summary>The one place where numeric tolerances are compared: |a − b| ≤ abs + rel·max(|a|, |b|).</summary>
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

    /// <summary>Asserts two sequences have the same length and agree element-wise.</summary>
    public static void Close(IReadOnlyList<double> expected, IReadOnlyList<double> actual, double abs = 1e-12, double rel = 1e-12, string? what = null)
    {
        Assert.Equal(expected.Count, actual.Count);
        for (var i = 0; i < expected.Count; i++)
        {
            Close(expected[i], actual[i], abs, rel, $"{what ?? "element"}[{i}]");
        }
    }
}
