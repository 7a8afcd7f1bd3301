namespace Partwise.Demo;

/// <summary>
/// exp, ln and cos(2πu) from IEEE-754 basic operations only (+, −, ×, ÷, exact scaling by powers of two).
/// </summary>
/// <remarks>
/// Why not <see cref="Math.Exp"/>: the runtime forwards those to the platform's C library, whose last-bit results
/// differ between library versions and operating systems. The demo files are committed and compared byte for byte,
/// so the generator uses these series instead; basic IEEE operations round the same everywhere. Accuracy is a few
/// units in the last place, far below the two decimals the files keep.
/// </remarks>
internal static class PortableMath
{
    // ln 2 split so that k·Ln2Hi is exact for |k| < 2^20 (the split used by the classic fdlibm reduction).
    private const double Ln2Hi = 6.93147180369123816490e-01;
    private const double Ln2Lo = 1.90821492927058770002e-10;
    private const double Ln2 = 0.6931471805599453094;
    private const double Sqrt2 = 1.4142135623730950488;
    private const double TwoPi = 6.283185307179586477;

    /// <summary>eˣ for |x| ≤ 700: x = k ln 2 + r with |r| ≤ ln2 / 2, then the Taylor series of eʳ and an exact 2ᵏ scaling.</summary>
    public static double Exp(double x)
    {
        if (!(Math.Abs(x) <= 700))
        {
            throw new ArgumentOutOfRangeException(nameof(x), x, "Exp is only defined here for |x| ≤ 700.");
        }

        var k = Math.Round(x / Ln2, MidpointRounding.ToEven);
        var r = (x - (k * Ln2Hi)) - (k * Ln2Lo);
        // |r| ≤ 0.347: 22 terms leave a remainder below 1e-24.
        double sum = 1, term = 1;
        for (var n = 1; n <= 22; n++)
        {
            term = term * r / n;
            sum += term;
        }

        return Math.ScaleB(sum, (int)k);
    }

    /// <summary>ln x for finite x &gt; 0: x = m·2ᵉ with m in [√½, √2), then ln m = 2 atanh((m − 1)/(m + 1)) by its series.</summary>
    public static double Log(double x)
    {
        if (!(x > 0) || !double.IsFinite(x))
        {
            throw new ArgumentOutOfRangeException(nameof(x), x, "Log needs a finite positive number.");
        }

        var e = Math.ILogB(x);
        var m = Math.ScaleB(x, -e);
        if (m >= Sqrt2)
        {
            m /= 2;
            e++;
        }

        var s = (m - 1) / (m + 1);
        var s2 = s * s;
        // |s| ≤ 0.172, s² ≤ 0.0295: 16 odd terms leave a remainder below 1e-25.
        double sum = 0, power = s;
        for (var n = 0; n < 16; n++)
        {
            sum += power / ((2 * n) + 1);
            power *= s2;
        }

        return (e * Ln2) + (2 * sum);
    }

    /// <summary>cos(2πu) for finite u: reduced to a quarter turn by symmetry, then the Taylor series of cos.</summary>
    public static double CosTurns(double u)
    {
        if (!double.IsFinite(u))
        {
            throw new ArgumentOutOfRangeException(nameof(u), u, "CosTurns needs a finite number of turns.");
        }

        var t = Math.Abs(u - Math.Round(u, MidpointRounding.ToEven)); // in [0, 0.5]; cos is even and 1-periodic in turns
        var sign = 1.0;
        if (t > 0.25)
        {
            t = 0.5 - t; // cos(π − a) = −cos a
            sign = -1.0;
        }

        var a = TwoPi * t; // in [0, π/2]
        var a2 = a * a;
        double sum = 1, term = 1;
        // (π/2)²⁴ / 24! < 1e-19.
        for (var n = 1; n <= 12; n++)
        {
            term = -term * a2 / ((2 * n) * ((2 * n) - 1));
            sum += term;
        }

        return sign * sum;
    }
}
