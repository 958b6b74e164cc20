namespace CopyNumber.Ensembles;

/// <summary>
/// The first four moments of one quantity at one grid time over n replicates: what the validation sample
/// keeps of each cell, enough for intervals on the mean and on the standard deviation.
/// </summary>
/// <param name="Count">n, the replicates.</param>
/// <param name="Mean">The sample mean.</param>
/// <param name="Variance">The unbiased sample variance s² (divisor n − 1); 0 for n &lt; 2.</param>
/// <param name="FourthCentral">The fourth central moment m4 = Σ(x − mean)^4 / n.</param>
public readonly record struct CellMoments(long Count, double Mean, double Variance, double FourthCentral)
{
    /// <summary>The moments of a histogram, in two exact passes over its distinct values.</summary>
    public static CellMoments Of(CountHistogram histogram)
    {
        ArgumentNullException.ThrowIfNull(histogram);
        var n = histogram.Total;
        if (n == 0) return new CellMoments(0, double.NaN, double.NaN, double.NaN);
        var sum = 0.0;
        foreach (var cell in histogram) sum += (double)cell.Value * cell.Frequency;
        var mean = sum / n;
        double m2 = 0, m4 = 0;
        foreach (var cell in histogram)
        {
            var d = cell.Value - mean;
            var d2 = d * d;
            m2 += d2 * cell.Frequency;
            m4 += d2 * d2 * cell.Frequency;
        }
        return new CellMoments(n, mean, n > 1 ? m2 / (n - 1) : 0.0, m4 / n);
    }
}
