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
/// se² = s_L²/(n_L·m_L²) + s_E²/(n_E·m_E²) (the two ensembles are independent). A cell is compared only
/// when both means are positive and more than 3 standard errors from 0: a relative error of a mean
/// indistinguishable from 0 means nothing.</para>
/// <para>Standard deviation: ln(s_L/s_E) = ½·ln(s_L²/s_E²) with Var(ln s²) ≈ (κ − (n − 3)/(n − 1))/n for
/// each ensemble, κ = m4/s⁴ the sample kurtosis (the large-sample variance of a sample variance, e.g.
/// Casella &amp; Berger 2002, Statistical Inference, ex. 5.8, quoted from memory), which does not assume
/// normal data.</para>
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
    /// The cells and their simultaneous intervals; <paramref name="sample"/> holds the exact moments per
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
        var intervals = pairs.Sum(p => (MeanComparable(p.Leap) && MeanComparable(p.Exact) ? 1 : 0) + (SdComparable(p.Leap) && SdComparable(p.Exact) ? 1 : 0));
        var z = intervals == 0 ? double.NaN : Normal.InvCDF(0, 1, 1 - FamilyAlpha / (2.0 * intervals));
        var cells = pairs.Select(p => new ValidationCell(p.Time, p.Name,
            MeanComparable(p.Leap) && MeanComparable(p.Exact) ? MeanInterval(p.Leap, p.Exact, z) : null,
            SdComparable(p.Leap) && SdComparable(p.Exact) ? SdInterval(p.Leap, p.Exact, z) : null)).ToArray();
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

    private static RelativeErrorInterval MeanInterval(CellMoments leap, CellMoments exact, double z)
    {
        var se = Math.Sqrt(leap.Variance / (leap.Count * leap.Mean * leap.Mean) + exact.Variance / (exact.Count * exact.Mean * exact.Mean));
        return RelativeErrorInterval.FromLogRatio(Math.Log(leap.Mean / exact.Mean), se, z);
    }

    private static RelativeErrorInterval SdInterval(CellMoments leap, CellMoments exact, double z)
    {
        var se = 0.5 * Math.Sqrt(LogVarianceVariance(leap) + LogVarianceVariance(exact));
        return RelativeErrorInterval.FromLogRatio(0.5 * Math.Log(leap.Variance / exact.Variance), se, z);
    }

    /// <summary>Var(ln s²) ≈ (κ − (n − 3)/(n − 1))/n, with the population m4 over the squared unbiased variance as κ.</summary>
    private static double LogVarianceVariance(CellMoments m)
    {
        double n = m.Count;
        var kurtosis = m.FourthCentral / (m.Variance * m.Variance);
        // A floor of 1/n keeps a two-valued distribution (κ near 1) from an interval of width 0.
        return Math.Max(kurtosis - (n - 3) / (n - 1), 1.0 / n) / n;
    }
}
