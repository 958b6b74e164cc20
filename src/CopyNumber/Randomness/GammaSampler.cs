namespace CopyNumber.Randomness;

/// <summary>
/// Gamma variates of shape α and scale 1 by Marsaglia &amp; Tsang (2000, ACM Trans. Math. Softw. 26:363):
/// d = α − 1/3, c = 1/√(9d), v = (1 + c·Z)³, accepted when ln U &lt; Z²/2 + d − d·v + d·ln v; for α &lt; 1 a
/// draw at α + 1 times U^(1/α). Normal variates by the polar method (Marsaglia &amp; Bray 1964, SIAM Rev.
/// 6:260), one value per call (the second is discarded so a draw depends on the stream position alone).
/// </summary>
public static class GammaSampler
{
    /// <summary>A gamma variate of shape <paramref name="shape"/> &gt; 0 and scale 1.</summary>
    public static double Sample(ref Xoshiro256StarStar rng, double shape)
    {
        if (shape < 1) return Sample(ref rng, shape + 1) * Math.Pow(rng.NextOpenDouble(), 1 / shape);
        var d = shape - 1.0 / 3;
        var c = 1 / Math.Sqrt(9 * d);
        while (true)
        {
            double z, v;
            do
            {
                z = StandardNormal(ref rng);
                v = 1 + c * z;
            } while (v <= 0);
            v = v * v * v;
            var u = rng.NextOpenDouble();
            if (Math.Log(u) < z * z / 2 + d - d * v + d * Math.Log(v)) return d * v;
        }
    }

    /// <summary>A standard normal variate.</summary>
    public static double StandardNormal(ref Xoshiro256StarStar rng)
    {
        while (true)
        {
            var a = 2 * rng.NextDouble() - 1;
            var b = 2 * rng.NextDouble() - 1;
            var s = a * a + b * b;
            if (s > 0 && s < 1) return a * Math.Sqrt(-2 * Math.Log(s) / s);
        }
    }
}
