namespace CopyNumber.Ensembles;

/// <summary>
/// The sample covariance of two species at one grid time, with the correlation coefficient and a standard error.
/// </summary>
/// <param name="Replicates">n, the replicates recorded at the grid time.</param>
/// <param name="Covariance">The unbiased sample covariance (divisor n − 1), copies²; NaN for n &lt; 2.</param>
/// <param name="Correlation">Covariance/(s_x·s_y); NaN when either species has no spread.</param>
/// <param name="StandardError">
/// √((s_x²·s_y² + Cov²)/(n − 1)), the standard error of a sample covariance under a bivariate normal law (Anderson 2003,
/// An Introduction to Multivariate Statistical Analysis, 3rd ed., §3.3, Wishart moments; quoted from memory); for a skewed or
/// heavy-tailed law it is an approximation (the fourth mixed moment is not accumulated).
/// </param>
public readonly record struct CovarianceEstimate(long Replicates, double Covariance, double Correlation, double StandardError)
{
    /// <summary>
    /// From the moments of the sum x + y and the exact histograms of x and y over the same replicates:
    /// Cov = (Var(x + y) − Var x − Var y)/2. The sum's variance is accumulated by the fixed merge tree, so the result is
    /// the same bits for any thread count, resumption or shard merge; its rounding error is about 10⁻¹⁶·(Var x + Var y).
    /// </summary>
    public static CovarianceEstimate Of(MomentAccumulator sum, CountHistogram x, CountHistogram y)
    {
        ArgumentNullException.ThrowIfNull(sum);
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        var n = sum.Count;
        if (n < 2 || x.IsEmpty || y.IsEmpty) return new CovarianceEstimate(n, double.NaN, double.NaN, double.NaN);
        var vx = DistributionSummary.From(x).Variance;
        var vy = DistributionSummary.From(y).Variance;
        var covariance = (sum.Variance - vx - vy) / 2;
        var correlation = vx > 0 && vy > 0 ? Math.Clamp(covariance / Math.Sqrt(vx * vy), -1, 1) : double.NaN;
        var standardError = Math.Sqrt((vx * vy + covariance * covariance) / (n - 1));
        return new CovarianceEstimate(n, covariance, correlation, standardError);
    }
}
