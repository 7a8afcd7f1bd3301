using BenchmarkDotNet.Running;
using Partwise.Benchmarks.Http;

namespace Partwise.Benchmarks;

/// <summary>
/// Runs the benchmarks picked on the command line, e.g. <c>--filter *Transform*</c>; <c>peak-memory</c> runs the
/// peak-memory probe of the coordinates endpoint instead.
/// </summary>
public static class BenchmarkProgram
{
    public static async Task Main(string[] args)
    {
        if (args is ["peak-memory"])
        {
            await PeakMemoryProbe.RunAsync().ConfigureAwait(false);
            return;
        }

        BenchmarkSwitcher.FromAssembly(typeof(BenchmarkProgram).Assembly).Run(args);
    }
}
