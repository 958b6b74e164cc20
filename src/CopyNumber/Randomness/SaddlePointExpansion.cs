namespace CopyNumber.Randomness;

/// <summary>
/// Log-probabilities of the Poisson and binomial laws written in the saddle-point form of Loader (2000,
/// "Fast and accurate computation of binomial probabilities", AT&amp;T Bell Labs technical note):
/// log k! is split into the Stirling main part and a small remainder (the Stirling error), and the
/// k·log(k/μ) + μ − k part (the deviance) is computed without cancellation. The naive form
/// k·log μ − μ − log k! subtracts numbers of size k·log k, which for k ≈ 10^12 (≈ 2.8·10^13) loses
/// about three decimal places of the O(1) result a rejection sampler compares against; this form keeps
/// the result accurate to a few ulps whatever the size of k.
/// </summary>
internal static class SaddlePointExpansion
{
    /// <summary>Arguments below this use exact tables; at and above it the asymptotic series is used.</summary>
    internal const int TableSize = 16;

    private const double HalfLogTwoPi = 0.91893853320467274178032973640562;

    private static readonly double[] LogFactorials = BuildLogFactorials();
    private static readonly double[] SmallStirlingErrors = BuildSmallStirlingErrors();

    /// <summary>log k! for 0 ≤ k &lt; <see cref="TableSize"/>.</summary>
    internal static double SmallLogFactorial(int k) => LogFactorials[k];

    /// <summary>
    /// The Stirling error δ(n) = log n! − (n + ½)·log n + n − ½·log 2π, for integer n ≥ 1.
    /// For n ≥ 16 the asymptotic series 1/(12n) − 1/(360n³) + 1/(1260n⁵) − 1/(1680n⁷) + 1/(1188n⁹)
    /// (Abramowitz &amp; Stegun 1964, 6.1.41) is used; the first omitted term, 691/(360360·n¹¹), is below
    /// 1.1·10^-16 there, so the series is exact to double precision.
    /// </summary>
    internal static double StirlingError(double n)
    {
        if (n < TableSize) return SmallStirlingErrors[(int)n];
        var inverse = 1.0 / n;
        var inverseSquared = inverse * inverse;
        return (1.0 / 12 - (1.0 / 360 - (1.0 / 1260 - (1.0 / 1680 - inverseSquared / 1188) * inverseSquared) * inverseSquared) * inverseSquared) * inverse;
    }

    /// <summary>
    /// The deviance D(x, μ) = x·log(x/μ) + μ − x ≥ 0, for x ≥ 0 and μ &gt; 0. Near x = μ it is evaluated by
    /// Loader's series in v = (x − μ)/(x + μ): D = (x − μ)·v + 2x·Σ_{j≥1} v^{2j+1}/(2j+1), which never
    /// subtracts nearly equal numbers; |v| &lt; 0.1 makes each term at most 1% of the previous one.
    /// </summary>
    internal static double Deviance(double x, double mean)
    {
        if (x == 0) return mean;
        var difference = x - mean;
        if (Math.Abs(difference) < 0.1 * (x + mean))
        {
            var v = difference / (x + mean);
            var sum = difference * v;
            var vSquared = v * v;
            var power = 2 * x * v;
            for (var j = 1; j < 40; j++)
            {
                power *= vSquared;
                var next = sum + power / (2 * j + 1);
                if (next == sum) return next;
                sum = next;
            }
            return sum;
        }
        return x * Math.Log(x / mean) + mean - x;
    }

    /// <summary>log P(K = k) for K ~ Poisson(μ), μ &gt; 0, integer k ≥ 0 held in a double.</summary>
    internal static double LogPoissonProbability(double k, double mean)
    {
        if (k < TableSize) return k * Math.Log(mean) - mean - LogFactorials[(int)k];
        return -StirlingError(k) - Deviance(k, mean) - HalfLogTwoPi - 0.5 * Math.Log(k);
    }

    /// <summary>
    /// log P(K = k) for K ~ Binomial(n, p), 0 &lt; p &lt; 1, integers 0 ≤ k ≤ n held in doubles; q = 1 − p
    /// is passed separately so that a caller holding an exact q loses nothing to 1 − p.
    /// </summary>
    internal static double LogBinomialProbability(double k, double trials, double p, double q)
    {
        if (k == 0) return trials * LogOnePlus(-p);
        if (k == trials) return trials * Math.Log(p);
        var rest = trials - k;
        return StirlingError(trials) - StirlingError(k) - StirlingError(rest)
            - Deviance(k, trials * p) - Deviance(rest, trials * q)
            + 0.5 * Math.Log(trials / (k * rest)) - HalfLogTwoPi;
    }

    /// <summary>
    /// log(1 + x) accurate for small |x| (x &gt; −1), by the correction log(u)·x/(u − 1) with u = fl(1 + x)
    /// (Goldberg 1991, "What every computer scientist should know about floating-point arithmetic",
    /// ACM Computing Surveys 23:5, Theorem 4). .NET's double.LogP1 is log(1 + x) and loses small x.
    /// </summary>
    internal static double LogOnePlus(double x)
    {
        var u = 1.0 + x;
        if (u == 1.0) return x;
        return Math.Log(u) * x / (u - 1.0);
    }

    private static double[] BuildLogFactorials()
    {
        var table = new double[TableSize];
        var factorial = 1.0;
        for (var k = 1; k < TableSize; k++)
        {
            factorial *= k; // 15! ≈ 1.3·10^12 < 2^53: every factorial here is exact in a double
            table[k] = Math.Log(factorial);
        }
        return table;
    }

    private static double[] BuildSmallStirlingErrors()
    {
        var table = new double[TableSize];
        for (var n = 1; n < TableSize; n++)
            table[n] = LogFactorials[n] - (n + 0.5) * Math.Log(n) + n - HalfLogTwoPi;
        return table;
    }
}
