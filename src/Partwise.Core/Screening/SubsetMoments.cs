namespace Partwise.Core.Screening;

/// <summary>
/// Mean and scatter of a subset of the rows of a row-major n × p matrix, without allocation.
/// </summary>
/// <remarks>
/// Two passes over the rows, shifted by the subset's first row: a coordinate that is constant on the subset then has
/// a variance of exactly zero (so the Cholesky check sees it as singular) instead of a rounding residue of the mean.
/// </remarks>
internal static class SubsetMoments
{
    /// <summary>
    /// mean = (1/m) Σ xᵢ and scatter = (1/divisor) Σ (xᵢ − mean)(xᵢ − mean)ᵀ over the rows <paramref name="rows"/>
    /// (m = rows.Length ≥ 1); only the lower triangle is accumulated, then mirrored.
    /// </summary>
    internal static void Compute(ReadOnlySpan<double> data, int p, ReadOnlySpan<int> rows, double divisor, Span<double> mean, Span<double> scatter, Span<double> work)
    {
        var m = rows.Length;
        var shift = data.Slice(rows[0] * p, p);
        var centre = work[..p];
        centre.Clear();
        foreach (var r in rows)
        {
            var x = data.Slice(r * p, p);
            for (var k = 0; k < p; k++)
            {
                centre[k] += x[k] - shift[k];
            }
        }

        for (var k = 0; k < p; k++)
        {
            centre[k] /= m;
        }

        scatter[..(p * p)].Clear();
        var d = work.Slice(p, p);
        foreach (var r in rows)
        {
            var x = data.Slice(r * p, p);
            for (var k = 0; k < p; k++)
            {
                d[k] = x[k] - shift[k] - centre[k];
            }

            for (var i = 0; i < p; i++)
            {
                var di = d[i];
                var row = scatter.Slice(i * p, i + 1);
                for (var k = 0; k <= i; k++)
                {
                    row[k] += di * d[k];
                }
            }
        }

        for (var i = 0; i < p; i++)
        {
            mean[i] = shift[i] + centre[i];
            for (var k = 0; k <= i; k++)
            {
                var v = scatter[(i * p) + k] / divisor;
                scatter[(i * p) + k] = v;
                scatter[(k * p) + i] = v;
            }
        }
    }
}
