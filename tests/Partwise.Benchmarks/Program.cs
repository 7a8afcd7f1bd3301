using BenchmarkDotNet.Running;

namespace Partwise.Benchmarks;

/// <summary>Runs the benchmarks picked on the command line, e.g. <c>--filter *Transform*</c>.</summary>
public static class BenchmarkProgram
{
    public static void Main(string[] args) =>
        BenchmarkSwitcher.FromAssembly(typeof(BenchmarkProgram).Assembly).Run(args);
}
