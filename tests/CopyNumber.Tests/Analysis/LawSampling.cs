using CopyNumber.Analysis;
using CopyNumber.Randomness;

namespace CopyNumber.Tests.Analysis;

/// <summary>Histograms drawn from a known law, for checks of the mode count on samples of exact laws.</summary>
internal static class LawSampling
{
    /// <summary>
    /// A multinomial sample of size n over the law's support, as a chain of conditional binomials
    /// (common practice): the number of replicates at value i is Binomial(n left, p_i / mass left).
    /// </summary>
    public static CountDistribution Sample(ref Xoshiro256StarStar rng, IReadOnlyList<long> values, IReadOnlyList<double> probabilities, long n)
    {
        var found = new List<long>();
        var replicates = new List<long>();
        var left = n;
        var massLeft = 1.0;
        for (var i = 0; i < probabilities.Count && left > 0; i++)
        {
            var share = massLeft > 0 ? Math.Clamp(probabilities[i] / massLeft, 0.0, 1.0) : 1.0;
            var k = i == probabilities.Count - 1 ? left : BinomialSampler.Sample(ref rng, left, share);
            if (k > 0) { found.Add(values[i]); replicates.Add(k); }
            left -= k;
            massLeft -= probabilities[i];
        }
        return CountDistribution.FromCounts(found, replicates);
    }

    /// <summary>Consecutive values from <paramref name="from"/>, one per probability.</summary>
    public static long[] Consecutive(long from, int count) => Enumerable.Range(0, count).Select(i => from + i).ToArray();
}
