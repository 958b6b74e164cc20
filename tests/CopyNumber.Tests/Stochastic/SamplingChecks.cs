using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Statistical checks with tolerances from the sampling error. Means are compared within 5 standard
/// errors; distributions by Pearson's chi-square test (Pearson 1900, Phil. Mag. 50:157), rejecting at the
/// 10⁻⁴ level, with cells pooled until every expected count is at least 5 (common practice, e.g.
/// Cochran 1954, Biometrics 10:417).
/// </summary>
internal static class SamplingChecks
{
    public const double Level = 1e-4;
    public const double StandardErrors = 5.0;
    private const double MinimumExpected = 5.0;

    public static double Mean(IReadOnlyList<long> values) => values.Average(v => (double)v);

    /// <summary>Unbiased sample variance (divisor n − 1).</summary>
    public static double Variance(IReadOnlyList<long> values)
    {
        var mean = Mean(values);
        return values.Sum(v => (v - mean) * (v - mean)) / (values.Count - 1);
    }

    /// <summary>The sample mean is within 5 standard errors of <paramref name="expected"/>, the SE from the exact variance.</summary>
    public static void MeanAgrees(IReadOnlyList<long> values, double expected, double exactVariance, string what)
    {
        var mean = Mean(values);
        var se = Math.Sqrt(exactVariance / values.Count);
        Assert.True(Math.Abs(mean - expected) <= StandardErrors * se,
            $"{what}: mean {mean} vs exact {expected}, |difference| > {StandardErrors} SE = {StandardErrors * se}");
    }

    /// <summary>
    /// The sample variance is within 5 standard errors of <paramref name="expected"/>; the standard error
    /// of s² is sqrt((m4 − s⁴(n−3)/(n−1))/n) with m4 the sample fourth central moment (e.g. Kendall &amp;
    /// Stuart, The Advanced Theory of Statistics, vol. 1; quoted from memory).
    /// </summary>
    public static void VarianceAgrees(IReadOnlyList<long> values, double expected, string what)
    {
        var n = values.Count;
        var mean = Mean(values);
        var s2 = Variance(values);
        var m4 = values.Sum(v => Math.Pow(v - mean, 4)) / n;
        var se = Math.Sqrt((m4 - s2 * s2 * (n - 3.0) / (n - 1.0)) / n);
        Assert.True(Math.Abs(s2 - expected) <= StandardErrors * se,
            $"{what}: variance {s2} vs exact {expected}, |difference| > {StandardErrors} SE = {StandardErrors * se}");
    }

    /// <summary>Pearson's goodness-of-fit test of integer samples against a pmf on 0, 1, 2, …</summary>
    public static void FollowsDistribution(IReadOnlyList<long> values, Func<long, double> pmf, string what)
    {
        var n = values.Count;
        var max = values.Max();
        var observed = new long[max + 1];
        foreach (var v in values)
        {
            Assert.True(v >= 0, $"{what}: negative sample {v}");
            observed[v]++;
        }
        // Cells 0 … max; the last cell takes the whole upper tail so the expected counts add to n.
        var expected = new double[max + 1];
        var cumulative = 0.0;
        for (var k = 0L; k < max; k++)
        {
            expected[k] = n * pmf(k);
            cumulative += pmf(k);
        }
        expected[max] = n * Math.Max(0.0, 1.0 - cumulative);
        var (statistic, cells) = Pearson(Pool(observed.Select(o => (double)o).ToArray(), expected));
        Assert.True(cells >= 2, $"{what}: too few cells for a chi-square test");
        var p = 1 - ChiSquared.CDF(cells - 1, statistic);
        Assert.True(p >= Level, $"{what}: chi-square {statistic:G5} on {cells - 1} degrees of freedom, p = {p:G3} < {Level}");
    }

    /// <summary>Pearson's two-sample test of homogeneity: both samples come from one distribution.</summary>
    public static void SameDistribution(IReadOnlyList<long> first, IReadOnlyList<long> second, string what)
    {
        var max = Math.Max(first.Max(), second.Max());
        var a = new double[max + 1];
        var b = new double[max + 1];
        foreach (var v in first) a[v]++;
        foreach (var v in second) b[v]++;
        // Pool adjacent values until each cell's expected count under homogeneity is ≥ 5 in both samples.
        var share = first.Count / (double)(first.Count + second.Count);
        var cellsA = new List<double>();
        var cellsB = new List<double>();
        double runA = 0, runB = 0;
        for (var k = 0; k <= max; k++)
        {
            runA += a[k];
            runB += b[k];
            var pooled = runA + runB;
            if (pooled * Math.Min(share, 1 - share) >= MinimumExpected)
            {
                cellsA.Add(runA);
                cellsB.Add(runB);
                runA = runB = 0;
            }
        }
        if (runA + runB > 0)
        {
            if (cellsA.Count == 0) { cellsA.Add(0); cellsB.Add(0); }
            cellsA[^1] += runA;
            cellsB[^1] += runB;
        }
        var statistic = 0.0;
        for (var c = 0; c < cellsA.Count; c++)
        {
            var total = cellsA[c] + cellsB[c];
            var ea = total * share;
            var eb = total * (1 - share);
            statistic += (cellsA[c] - ea) * (cellsA[c] - ea) / ea + (cellsB[c] - eb) * (cellsB[c] - eb) / eb;
        }
        var dof = cellsA.Count - 1;
        Assert.True(dof >= 1, $"{what}: too few cells for a chi-square test");
        var p = 1 - ChiSquared.CDF(dof, statistic);
        Assert.True(p >= Level, $"{what}: two-sample chi-square {statistic:G5} on {dof} degrees of freedom, p = {p:G3} < {Level}");
    }

    /// <summary>Merges adjacent cells, left to right, until each expected count is ≥ 5; a short remainder joins the last cell.</summary>
    private static List<(double Observed, double Expected)> Pool(double[] observed, double[] expected)
    {
        var cells = new List<(double, double)>();
        double o = 0, e = 0;
        for (var k = 0; k < observed.Length; k++)
        {
            o += observed[k];
            e += expected[k];
            if (e >= MinimumExpected)
            {
                cells.Add((o, e));
                o = e = 0;
            }
        }
        if (o > 0 || e > 0)
        {
            if (cells.Count == 0) cells.Add((0, 0));
            cells[^1] = (cells[^1].Item1 + o, cells[^1].Item2 + e);
        }
        return cells;
    }

    private static (double Statistic, int Cells) Pearson(List<(double Observed, double Expected)> cells)
    {
        var statistic = 0.0;
        foreach (var (o, e) in cells)
        {
            if (e <= 0)
            {
                // A cell the distribution gives no mass to but the sample reached: certain rejection.
                if (o > 0) return (double.PositiveInfinity, cells.Count);
                continue;
            }
            statistic += (o - e) * (o - e) / e;
        }
        return (statistic, cells.Count);
    }

    public static Func<long, double> Poisson(double mean) => k => MathNet.Numerics.Distributions.Poisson.PMF(mean, (int)k);

    public static Func<long, double> Binomial(double p, long n) => k => k > n ? 0.0 : MathNet.Numerics.Distributions.Binomial.PMF(p, (int)n, (int)k);
}
