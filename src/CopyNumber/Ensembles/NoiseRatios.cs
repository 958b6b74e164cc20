namespace CopyNumber.Ensembles;

/// <summary>
/// The Fano factor and the squared coefficient of variation of a sample, defined once for every table and
/// printout. Both measure noise only for a nonnegative quantity with a positive mean: a signed quantity (a
/// difference of two counts) can have a mean near 0 whatever its spread, which gave Fano factors in the
/// hundreds. Otherwise they are NaN.
/// </summary>
public static class NoiseRatios
{
    /// <summary>variance/mean, or NaN unless the minimum is ≥ 0 and the mean &gt; 0.</summary>
    /// <param name="mean">The sample mean.</param>
    /// <param name="variance">The sample variance.</param>
    /// <param name="minimum">The smallest value in the sample.</param>
    public static double Fano(double mean, double variance, double minimum) =>
        Defined(mean, minimum) ? variance / mean : double.NaN;

    /// <summary>variance/mean², or NaN unless the minimum is ≥ 0 and the mean &gt; 0.</summary>
    /// <param name="mean">The sample mean.</param>
    /// <param name="variance">The sample variance.</param>
    /// <param name="minimum">The smallest value in the sample.</param>
    public static double SquaredCoefficientOfVariation(double mean, double variance, double minimum) =>
        Defined(mean, minimum) ? variance / (mean * mean) : double.NaN;

    private static bool Defined(double mean, double minimum) => minimum >= 0 && mean > 0;
}
