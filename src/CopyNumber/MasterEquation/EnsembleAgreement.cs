using CopyNumber.Analysis;

namespace CopyNumber.MasterEquation;

/// <summary>How far one quantity's ensemble lies from its exact law over the grid.</summary>
/// <param name="Quantity">The quantity's name.</param>
/// <param name="LargestDistance">The largest Kolmogorov distance sup_x |F_ensemble(x) − F_exact(x)| over the grid times.</param>
/// <param name="Time">The grid time where it was largest.</param>
/// <param name="Allowed">The distance allowed at that time: the Kolmogorov critical value at the per-test level plus twice the projection bound.</param>
/// <param name="Replicates">The replicates at that time.</param>
/// <param name="Ratio">The largest of distance / allowed over the grid times; above 1 means disagreement.</param>
public sealed record QuantityAgreement(string Quantity, double LargestDistance, double Time, double Allowed, long Replicates, double Ratio)
{
    /// <summary>True when the ensemble agrees with the exact law at every grid time.</summary>
    public bool Agrees => Ratio <= 1;
}

/// <summary>The ensemble against the exact law for every count quantity, with the family-wise level of the whole comparison.</summary>
/// <param name="Quantities">One entry per count quantity compared.</param>
/// <param name="FamilyWiseLevel">α, the probability that any test of the comparison fires when the ensemble is a sample of the exact law.</param>
/// <param name="Tests">The number of (grid time, quantity) tests α is shared among (Bonferroni).</param>
/// <param name="States">States of the projection at the end of the exact solve.</param>
/// <param name="LargestBound">The largest projection bound over the grid.</param>
public sealed record EnsembleAgreement(IReadOnlyList<QuantityAgreement> Quantities, double FamilyWiseLevel, int Tests, int States, double LargestBound)
{
    /// <summary>True when every quantity agrees.</summary>
    public bool Agrees => Quantities.All(q => q.Agrees);
}

/// <summary>One quantity's ensemble at one grid time: its histogram as values and frequencies, and the replicates behind it.</summary>
/// <param name="Values">Counts seen, increasing.</param>
/// <param name="Frequencies">Fractions of the replicates at each count.</param>
/// <param name="Replicates">n.</param>
public sealed record EnsembleHistogram(IReadOnlyList<long> Values, IReadOnlyList<double> Frequencies, long Replicates);

/// <summary>
/// Checks an ensemble against the exact law of the master equation, per count quantity and grid time, by the
/// Kolmogorov distance D = sup_x |F_n(x) − F(x)| between the ensemble's and the exact distribution functions.
/// Under the hypothesis that the n replicates are a sample of the exact law, √n·D follows Kolmogorov's
/// distribution asymptotically (Kolmogorov 1933; for a discrete law the test is conservative, its level below
/// the nominal one — common practice), and Stephens' finite-n form (Stephens 1970, J. R. Stat. Soc. B 32:115)
/// gives the critical value λ_α/(√n + 0.12 + 0.11/√n). The family-wise level α covers every grid time and
/// quantity together: each of the m tests runs at α/m (Bonferroni, valid although the grid times of one
/// ensemble are dependent). The exact law is known only to its projection bound b (its normalised marginal is
/// within 2b in total variation, hence in distribution function), so 2b is added to the critical value.
/// Real-valued readouts have no histogram and are not compared.
/// </summary>
public static class EnsembleAgreementTest
{
    /// <summary>The default family-wise level.</summary>
    public const double DefaultLevel = 0.01;

    /// <summary>
    /// Compares; <paramref name="ensemble"/> gives the histogram of a quantity (by name) at a grid index, or null
    /// when the ensemble has none there. Quantities of <paramref name="exact"/> without a count law are skipped.
    /// </summary>
    public static EnsembleAgreement Compare(ExactSolution exact, Func<string, int, EnsembleHistogram?> ensemble, double level = DefaultLevel)
    {
        ArgumentNullException.ThrowIfNull(exact);
        ArgumentNullException.ThrowIfNull(ensemble);
        if (!(level > 0 && level < 1)) throw new ArgumentOutOfRangeException(nameof(level), "the family-wise level lies in (0, 1)");
        var pairs = new List<(int Quantity, int Time, EnsembleHistogram Histogram)>();
        for (var q = 0; q < exact.Quantities.Count; q++)
            for (var k = 0; k < exact.Grid.Count; k++)
                if (exact.Law(k, q).Distribution is not null && ensemble(exact.Quantities[q].Name, k) is { Replicates: > 0 } h)
                    pairs.Add((q, k, h));
        var tests = pairs.Count;
        var lambda = tests == 0 ? double.NaN : KolmogorovQuantile(level / tests);
        var results = new List<QuantityAgreement>();
        foreach (var group in pairs.GroupBy(p => p.Quantity))
        {
            QuantityAgreement? worst = null;
            foreach (var (q, k, h) in group)
            {
                var distance = Distance(exact.Law(k, q).Distribution!, h);
                var root = Math.Sqrt(h.Replicates);
                var allowed = lambda / (root + 0.12 + 0.11 / root) + 2 * exact.Bound[k];
                var ratio = distance / allowed;
                if (worst is null || ratio > worst.Ratio)
                    worst = new QuantityAgreement(exact.Quantities[q].Name, distance, exact.Grid[k], allowed, h.Replicates, ratio);
            }
            results.Add(worst!);
        }
        return new EnsembleAgreement(results, level, tests, exact.States[^1], exact.Bound.Max());
    }

    /// <summary>sup_x |F_ensemble(x) − F_exact(x)| over the union of both supports (both are step functions).</summary>
    public static double Distance(CountDistribution exact, EnsembleHistogram sample)
    {
        ArgumentNullException.ThrowIfNull(exact);
        ArgumentNullException.ThrowIfNull(sample);
        int i = 0, j = 0;
        double f = 0, g = 0, largest = 0;
        while (i < exact.Values.Count || j < sample.Values.Count)
        {
            var x = Math.Min(i < exact.Values.Count ? exact.Values[i] : long.MaxValue, j < sample.Values.Count ? sample.Values[j] : long.MaxValue);
            while (i < exact.Values.Count && exact.Values[i] == x) f += exact.Probabilities[i++];
            while (j < sample.Values.Count && sample.Values[j] == x) g += sample.Frequencies[j++];
            largest = Math.Max(largest, Math.Abs(f - g));
        }
        return largest;
    }

    /// <summary>λ with P(K &gt; λ) = <paramref name="alpha"/> for Kolmogorov's K: Q(λ) = 2Σ_{k≥1}(−1)^{k−1}e^{−2k²λ²}, by bisection.</summary>
    public static double KolmogorovQuantile(double alpha)
    {
        double low = 0.3, high = 10;
        for (var iteration = 0; iteration < 100; iteration++)
        {
            var mid = 0.5 * (low + high);
            if (KolmogorovTail(mid) > alpha) low = mid; else high = mid;
        }
        return 0.5 * (low + high);
    }

    /// <summary>Q(λ) = P(K &gt; λ), the alternating series (it converges fast for λ ≥ 0.3).</summary>
    public static double KolmogorovTail(double lambda)
    {
        var sum = 0.0;
        for (var k = 1; k <= 100; k++)
        {
            var term = Math.Exp(-2.0 * k * k * lambda * lambda);
            sum += (k % 2 == 1 ? 1 : -1) * term;
            if (term < 1e-18) break;
        }
        return Math.Clamp(2 * sum, 0, 1);
    }
}
