using MathNet.Numerics.Distributions;

namespace CopyNumber.Ensembles;

/// <summary>One grid time and quantity whose leap and exact moments were compared.</summary>
/// <param name="Time">Model time.</param>
/// <param name="Quantity">Species or count readout.</param>
/// <param name="Mean">Interval for mean_leap/mean_exact − 1; null when the means cannot be compared relatively.</param>
/// <param name="StandardDeviation">Interval for sd_leap/sd_exact − 1; null when either variance is 0 or n &lt; 4.</param>
public sealed record ValidationCell(double Time, string Quantity, RelativeErrorInterval? Mean, RelativeErrorInterval? StandardDeviation);

/// <summary>What the validation sample concluded.</summary>
public enum ValidationVerdict
{
    /// <summary>Every interval includes 0: no leaping error detected at the sample's resolution.</summary>
    Consistent,

    /// <summary>Some interval excludes 0, but none excludes agreement within the tolerances (1% mean, 2% sd).</summary>
    WithinTolerance,

    /// <summary>Some interval lies wholly outside the tolerance: the leaping error is established to exceed it.</summary>
    OutsideTolerance,

    /// <summary>No cell could be compared (too few replicates, or every mean indistinguishable from 0).</summary>
    NotJudged,
}

/// <summary>
/// Compares the tau-leaping ensemble with the exact validation sample at every grid time after 0 and every
/// count quantity (docs/methods.md, "The validation sample").
/// </summary>
/// <remarks>
/// <para>Mean: the log of the ratio of the means, with the delta-method standard error
/// se² = s_L²/(n_L·m_L²) + s_E²/(n_E·m_E²) (the two ensembles are independent) and Student's t quantile at
/// the Welch–Satterthwaite degrees of freedom. A cell is compared only when both means are positive and
/// more than 3 standard errors from 0: a relative error of a mean indistinguishable from 0 means nothing.</para>
/// <para>Standard deviation: s_L²/s_E² against the F distribution with degrees of freedom 2/Var(ln s²) per
/// ensemble, Var(ln s²) ≈ (κ − (n − 3)/(n − 1))/n with κ = m4/s⁴ the kurtosis pooled over both ensembles
/// (the large-sample variance of a sample variance, quoted from memory), which does not assume normal
/// data and gives n − 1 for normal data.</para>
/// <para>Simultaneity: the family is every interval computed (means and standard deviations, all cells);
/// each is built at level 1 − α/C with α = 0.01 (Bonferroni), so with probability at least 99% all C
/// intervals cover their true relative errors at once, up to the normal approximation.</para>
/// </remarks>
public static class ValidationComparison
{
    /// <summary>Family-wise error rate of the simultaneous intervals.</summary>
    public const double FamilyAlpha = 0.01;

    /// <summary>Largest relative error of the mean that counts as agreement (1%).</summary>
    public const double MeanTolerance = 0.01;

    /// <summary>Largest relative error of the standard deviation that counts as agreement (2%).</summary>
    public const double StandardDeviationTolerance = 0.02;

    /// <summary>Standard errors a mean must lie from 0 for its relative error to be compared.</summary>
    public const double ZeroMeanStandardErrors = 3;

    /// <summary>
    /// The cells and their simultaneous intervals (each at tail probability α/(2C) on either side; the Z
    /// returned is the normal quantile of that level, for the record); <paramref name="sample"/> holds the exact moments per
    /// grid point k and count quantity q at [k·Q + q], like the leap ensemble's histograms.
    /// </summary>
    public static (IReadOnlyList<ValidationCell> Cells, int Intervals, double Z) Compare(EnsembleResult leap, IReadOnlyList<CellMoments> sample)
    {
        ArgumentNullException.ThrowIfNull(leap);
        ArgumentNullException.ThrowIfNull(sample);
        var quantities = leap.CountQuantities;
        if (sample.Count != leap.Grid.Count * quantities.Count) throw new ArgumentException("one sample cell per grid point and count quantity is needed", nameof(sample));
        var pairs = new List<(double Time, string Name, CellMoments Leap, CellMoments Exact)>();
        for (var k = 0; k < leap.Grid.Count; k++)
        {
            if (leap.Grid[k] <= 0) continue; // the initial state is the same in both
            for (var q = 0; q < quantities.Count; q++)
                pairs.Add((leap.Grid[k], quantities[q].Name, CellMoments.Of(leap.Histogram(k, q)), sample[k * quantities.Count + q]));
        }
        return Compare(pairs);
    }

    /// <summary>The cells and their simultaneous intervals for given (time, quantity, leap moments, exact moments) cells.</summary>
    public static (IReadOnlyList<ValidationCell> Cells, int Intervals, double Z) Compare(IReadOnlyList<(double Time, string Name, CellMoments Leap, CellMoments Exact)> pairs)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        var intervals = pairs.Sum(p => (MeanComparable(p.Leap) && MeanComparable(p.Exact) ? 1 : 0) + (SdComparable(p.Leap) && SdComparable(p.Exact) ? 1 : 0));
        var z = intervals == 0 ? double.NaN : Normal.InvCDF(0, 1, 1 - FamilyAlpha / (2.0 * intervals));
        var tail = intervals == 0 ? double.NaN : FamilyAlpha / (2.0 * intervals);
        var cells = pairs.Select(p => new ValidationCell(p.Time, p.Name,
            MeanComparable(p.Leap) && MeanComparable(p.Exact) ? MeanInterval(p.Leap, p.Exact, tail) : null,
            SdComparable(p.Leap) && SdComparable(p.Exact) ? SdInterval(p.Leap, p.Exact, tail) : null)).ToArray();
        return (cells, intervals, z);
    }

    /// <summary>The verdict over all cells.</summary>
    public static ValidationVerdict Judge(IReadOnlyList<ValidationCell> cells)
    {
        ArgumentNullException.ThrowIfNull(cells);
        var means = cells.Where(c => c.Mean is not null).Select(c => c.Mean!.Value).ToArray();
        var sds = cells.Where(c => c.StandardDeviation is not null).Select(c => c.StandardDeviation!.Value).ToArray();
        if (means.Length + sds.Length == 0) return ValidationVerdict.NotJudged;
        if (means.Any(i => i.ExcludesWithin(MeanTolerance)) || sds.Any(i => i.ExcludesWithin(StandardDeviationTolerance))) return ValidationVerdict.OutsideTolerance;
        if (means.Any(i => i.ExcludesZero) || sds.Any(i => i.ExcludesZero)) return ValidationVerdict.WithinTolerance;
        return ValidationVerdict.Consistent;
    }

    /// <summary>
    /// The cell to report for one kind of interval (the worst-grid-time rule): the one lying farthest outside
    /// the tolerance if any does, else the one with the largest |estimate|; null when none was compared.
    /// </summary>
    public static ValidationCell? Worst(IReadOnlyList<ValidationCell> cells, Func<ValidationCell, RelativeErrorInterval?> interval, double tolerance)
    {
        ArgumentNullException.ThrowIfNull(cells);
        ArgumentNullException.ThrowIfNull(interval);
        return cells.Where(c => interval(c) is not null)
            .OrderByDescending(c => interval(c)!.Value.BeyondTolerance(tolerance))
            .ThenByDescending(c => Math.Abs(interval(c)!.Value.Estimate))
            .FirstOrDefault();
    }

    private static bool MeanComparable(CellMoments m) =>
        m.Count >= 2 && m.Mean > 0 && m.Mean > ZeroMeanStandardErrors * Math.Sqrt(m.Variance / m.Count);

    private static bool SdComparable(CellMoments m) => m.Count >= 4 && m.Variance > 0;

    /// <summary>
    /// The log-ratio of the means with Student's t quantile at the Welch–Satterthwaite degrees of freedom
    /// (Welch 1947, Biometrika 34:28), which matters when the exact sample is a few dozen replicates.
    /// </summary>
    private static RelativeErrorInterval MeanInterval(CellMoments leap, CellMoments exact, double tail)
    {
        var a = leap.Variance / (leap.Count * leap.Mean * leap.Mean);
        var b = exact.Variance / (exact.Count * exact.Mean * exact.Mean);
        var se = Math.Sqrt(a + b);
        var df = se == 0 ? double.PositiveInfinity : (a + b) * (a + b) / (a * a / (leap.Count - 1) + b * b / (exact.Count - 1));
        var t = double.IsFinite(df) ? StudentT.InvCDF(0, 1, df, 1 - tail) : Normal.InvCDF(0, 1, 1 - tail);
        return RelativeErrorInterval.FromLogRatio(Math.Log(leap.Mean / exact.Mean), se, t);
    }

    /// <summary>
    /// The ratio of the variances against the F distribution with kurtosis-adjusted degrees of freedom
    /// d = 2/Var(ln s²) per ensemble (n − 1 for normal data), the kurtosis pooled over both ensembles
    /// (in the spirit of Shoemaker 2003, The American Statistician 57:105, quoted from memory); the square
    /// root gives the interval for the standard deviations.
    /// </summary>
    private static RelativeErrorInterval SdInterval(CellMoments leap, CellMoments exact, double tail)
    {
        var kurtosis = (leap.Count * Kurtosis(leap) + exact.Count * Kurtosis(exact)) / (leap.Count + exact.Count);
        var dfLeap = 2 / LogVarianceVariance(kurtosis, leap.Count);
        var dfExact = 2 / LogVarianceVariance(kurtosis, exact.Count);
        var ratio = leap.Variance / exact.Variance;
        var upper = ratio / FisherSnedecor.InvCDF(dfLeap, dfExact, tail);
        var lower = ratio / FisherSnedecor.InvCDF(dfLeap, dfExact, 1 - tail);
        return new RelativeErrorInterval(Math.Sqrt(ratio) - 1, Math.Sqrt(lower) - 1, Math.Sqrt(upper) - 1);
    }

    private static double Kurtosis(CellMoments m) => m.FourthCentral / (m.Variance * m.Variance);

    /// <summary>Var(ln s²) ≈ (κ − (n − 3)/(n − 1))/n; floored at 1/n² so a two-valued law (κ near 1) keeps a finite df.</summary>
    private static double LogVarianceVariance(double kurtosis, long count)
    {
        double n = count;
        return Math.Max(kurtosis - (n - 3) / (n - 1), 1.0 / n) / n;
    }
}
