namespace CopyNumber.Ensembles;

/// <summary>
/// A confidence interval for a relative error, e.g. mean_leap/mean_exact − 1, with its point estimate.
/// Dimensionless (0.01 is 1%).
/// </summary>
/// <param name="Estimate">The point estimate.</param>
/// <param name="Lower">Lower end.</param>
/// <param name="Upper">Upper end.</param>
public readonly record struct RelativeErrorInterval(double Estimate, double Lower, double Upper)
{
    /// <summary>Half the width: the smallest error the interval can resolve.</summary>
    public double HalfWidth => (Upper - Lower) / 2;

    /// <summary>True when 0 lies outside the interval: an error is detected.</summary>
    public bool ExcludesZero => Lower > 0 || Upper < 0;

    /// <summary>True when the interval lies wholly outside [−tolerance, tolerance]: an error larger than the tolerance is established.</summary>
    public bool ExcludesWithin(double tolerance) => Lower > tolerance || Upper < -tolerance;

    /// <summary>How far the interval lies outside [−tolerance, tolerance] (0 when it overlaps it).</summary>
    public double BeyondTolerance(double tolerance) => Math.Max(0, Math.Max(Lower - tolerance, -tolerance - Upper));

    /// <summary>
    /// exp(log-ratio ± z·se) − 1: the interval for a ratio − 1 built on the log scale, where the delta
    /// method's normal approximation is better for a ratio (common practice).
    /// </summary>
    public static RelativeErrorInterval FromLogRatio(double logRatio, double standardError, double z) =>
        new(double.ExpM1(logRatio), double.ExpM1(logRatio - z * standardError), double.ExpM1(logRatio + z * standardError));
}
