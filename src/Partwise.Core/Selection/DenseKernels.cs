using System.Numerics;
using System.Runtime.InteropServices;

namespace Partwise.Core.Selection;

/// <summary>Vectorised inner loops over contiguous spans (dot products and fused row updates).</summary>
internal static class DenseKernels
{
    /// <summary>Σ a_i b_i.</summary>
    public static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        b = b[..a.Length];
        var va = MemoryMarshal.Cast<double, Vector<double>>(a);
        var vb = MemoryMarshal.Cast<double, Vector<double>>(b);
        var acc = Vector<double>.Zero;
        for (var i = 0; i < va.Length; i++)
        {
            acc += va[i] * vb[i];
        }

        var sum = Vector.Sum(acc);
        for (var i = va.Length * Vector<double>.Count; i < a.Length; i++)
        {
            sum += a[i] * b[i];
        }

        return sum;
    }

    /// <summary>Four dot products of <paramref name="a"/> with b0 … b3 in one pass over <paramref name="a"/>.</summary>
    public static void Dot4(ReadOnlySpan<double> a, ReadOnlySpan<double> b0, ReadOnlySpan<double> b1, ReadOnlySpan<double> b2, ReadOnlySpan<double> b3, Span<double> result)
    {
        var n = a.Length;
        b0 = b0[..n];
        b1 = b1[..n];
        b2 = b2[..n];
        b3 = b3[..n];
        var va = MemoryMarshal.Cast<double, Vector<double>>(a);
        var v0 = MemoryMarshal.Cast<double, Vector<double>>(b0);
        var v1 = MemoryMarshal.Cast<double, Vector<double>>(b1);
        var v2 = MemoryMarshal.Cast<double, Vector<double>>(b2);
        var v3 = MemoryMarshal.Cast<double, Vector<double>>(b3);
        Vector<double> s0 = Vector<double>.Zero, s1 = Vector<double>.Zero, s2 = Vector<double>.Zero, s3 = Vector<double>.Zero;
        for (var i = 0; i < va.Length; i++)
        {
            var x = va[i];
            s0 += x * v0[i];
            s1 += x * v1[i];
            s2 += x * v2[i];
            s3 += x * v3[i];
        }

        double r0 = Vector.Sum(s0), r1 = Vector.Sum(s1), r2 = Vector.Sum(s2), r3 = Vector.Sum(s3);
        for (var i = va.Length * Vector<double>.Count; i < n; i++)
        {
            var x = a[i];
            r0 += x * b0[i];
            r1 += x * b1[i];
            r2 += x * b2[i];
            r3 += x * b3[i];
        }

        result[0] += r0;
        result[1] += r1;
        result[2] += r2;
        result[3] += r3;
    }

    /// <summary>r ← r + α x + β y.</summary>
    public static void AddScaled2(Span<double> r, double alpha, ReadOnlySpan<double> x, double beta, ReadOnlySpan<double> y)
    {
        var n = r.Length;
        x = x[..n];
        y = y[..n];
        var vr = MemoryMarshal.Cast<double, Vector<double>>(r);
        var vx = MemoryMarshal.Cast<double, Vector<double>>(x);
        var vy = MemoryMarshal.Cast<double, Vector<double>>(y);
        var va = new Vector<double>(alpha);
        var vb = new Vector<double>(beta);
        for (var i = 0; i < vr.Length; i++)
        {
            vr[i] += (va * vx[i]) + (vb * vy[i]);
        }

        for (var i = vr.Length * Vector<double>.Count; i < n; i++)
        {
            r[i] += (alpha * x[i]) + (beta * y[i]);
        }
    }

    /// <summary>r ← r + α x.</summary>
    public static void AddScaled(Span<double> r, double alpha, ReadOnlySpan<double> x)
    {
        var n = r.Length;
        x = x[..n];
        var vr = MemoryMarshal.Cast<double, Vector<double>>(r);
        var vx = MemoryMarshal.Cast<double, Vector<double>>(x);
        var va = new Vector<double>(alpha);
        for (var i = 0; i < vr.Length; i++)
        {
            vr[i] += va * vx[i];
        }

        for (var i = vr.Length * Vector<double>.Count; i < n; i++)
        {
            r[i] += alpha * x[i];
        }
    }
}
