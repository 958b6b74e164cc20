namespace CopyNumber.Randomness;

/// <summary>
/// Geometric variates on 0, 1, 2, … with P(B = k) = (1 − q)·q^k, by inversion: B = ⌊ln U / ln q⌋ for U
/// uniform on (0, 1], since P(B ≥ k) = q^k (Devroye 1986, Non-Uniform Random Variate Generation, ch. X;
/// quoted from memory). Exact up to the rounding of the logarithms; O(1) per draw.
/// </summary>
public static class GeometricSampler
{
    /// <summary>ln q for a geometric law of mean <paramref name="mean"/> (q = b/(1 + b)); −∞ for mean 0.</summary>
    public static double LogRatio(double mean) => mean > 0 ? -LogOnePlus(1 / mean) : double.NegativeInfinity;

    // ln(1 + x) without the cancellation of 1 + x for small x (series to x³ below 10⁻⁴: error below x⁴/4 ≤ 2.5·10⁻¹⁷).
    private static double LogOnePlus(double x) => x < 1e-4 ? x - x * x / 2 + x * x * x / 3 : Math.Log(1 + x);

    /// <summary>One draw, given ln q from <see cref="LogRatio"/> (−∞ gives 0).</summary>
    public static long Sample(ref Xoshiro256StarStar rng, double logRatio)
    {
        if (double.IsNegativeInfinity(logRatio)) return 0;
        var k = Math.Floor(Math.Log(rng.NextOpenDouble()) / logRatio);
        return k < 4e18 ? (long)k : long.MaxValue;
    }
}
