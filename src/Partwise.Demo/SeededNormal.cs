namespace Partwise.Demo;

/// <summary>Standard normal draws from a seeded <see cref="Random"/> by the Box–Muller transform.</summary>
/// <remarks>
/// Box &amp; Muller (1958), Ann. Math. Statist. 29:610-611: z = √(−2 ln u₁) cos(2π u₂) for independent uniforms
/// u₁ in (0, 1] and u₂ in [0, 1). Only the cosine half is used, so each draw takes two uniforms and the sequence
/// does not depend on a cached second value. <see cref="Random"/> with a seed runs the same algorithm on every
/// runtime, and <see cref="PortableMath"/> keeps the transcendental functions platform independent.
/// </remarks>
internal sealed class SeededNormal(int seed)
{
    private readonly Random _random = new(seed);

    /// <summary>A uniform draw in [0, 1).</summary>
    public double NextUniform() => _random.NextDouble();

    /// <summary>A standard normal draw.</summary>
    public double Next()
    {
        var u1 = 1.0 - _random.NextDouble();
        var u2 = _random.NextDouble();
        return Math.Sqrt(-2.0 * PortableMath.Log(u1)) * PortableMath.CosTurns(u2);
    }
}
