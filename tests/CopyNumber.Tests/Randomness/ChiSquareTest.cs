using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Randomness;

/// <summary>
/// Pearson's chi-square goodness-of-fit test of integer draws against an exact probability mass
/// function (Pearson 1900, Philosophical Magazine 50:157), with neighbouring outcomes merged until every
/// bin expects at least 5 draws (Cochran 1954, Biometrics 10:417 — the usual rule of thumb).
/// </summary>
internal static class ChiSquareTest
{
    /// <summary>The test's significance level: a correct sampler fails with this probability per seed.</summary>
    public const double Level = 1e-4;

    /// <summary>
    /// The chi-square p-value of <paramref name="draws"/> against <paramref name="probability"/>
    /// on the support [<paramref name="low"/>, <paramref name="high"/>], which must hold all but a
    /// negligible mass; draws outside it fail the test outright.
    /// </summary>
    public static double PValue(IReadOnlyList<long> draws, Func<long, double> probability, long low, long high)
    {
        var observed = new long[high - low + 1];
        foreach (var draw in draws)
        {
            Assert.InRange(draw, low, high);
            observed[draw - low]++;
        }
        var n = (double)draws.Count;
        var binExpected = new List<double>();
        var binObserved = new List<long>();
        double expected = 0;
        long count = 0;
        for (var k = low; k <= high; k++)
        {
            expected += n * probability(k);
            count += observed[k - low];
            if (expected >= 5)
            {
                binExpected.Add(expected);
                binObserved.Add(count);
                expected = 0;
                count = 0;
            }
        }
        // The remainder of the upper tail joins the last full bin.
        binExpected[^1] += expected;
        binObserved[^1] += count;
        Assert.True(binExpected.Count >= 2, "too few bins for a chi-square test");

        var statistic = 0.0;
        for (var i = 0; i < binExpected.Count; i++)
        {
            var difference = binObserved[i] - binExpected[i];
            statistic += difference * difference / binExpected[i];
        }
        return 1 - ChiSquared.CDF(binExpected.Count - 1, statistic);
    }
}
