namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// Skewness γ = μ₃/σ³ and kurtosis κ = μ₄/σ⁴ of a sampled histogram (plug-in central moments), the shape
/// the normal approximations of the verdicts depend on. NaN when the histogram is missing or has no spread.
/// </summary>
internal readonly record struct SampleShape(double Skewness, double Kurtosis)
{
    public static readonly SampleShape Unknown = new(double.NaN, double.NaN);

    public static SampleShape Of(CountDistribution? histogram)
    {
        if (histogram is null) return Unknown;
        var values = histogram.Values;
        var p = histogram.Probabilities;
        double mean = 0;
        for (var i = 0; i < values.Count; i++) mean += p[i] * values[i];
        double m2 = 0, m3 = 0, m4 = 0;
        for (var i = 0; i < values.Count; i++)
        {
            var d = values[i] - mean;
            var d2 = d * d;
            m2 += p[i] * d2;
            m3 += p[i] * d2 * d;
            m4 += p[i] * d2 * d2;
        }
        return m2 > 0 ? new SampleShape(m3 / Math.Pow(m2, 1.5), m4 / (m2 * m2)) : Unknown;
    }

    /// <summary>
    /// Cochran's rule for the normal approximation of a sample mean: n &gt; 25·G₁² (Cochran 1977, Sampling
    /// Techniques, 3rd ed., §2.15; quoted from memory). True when the shape is unknown (no histogram).
    /// </summary>
    public bool MeanIsNearNormal(long replicates) => double.IsNaN(Skewness) || replicates > 25 * Skewness * Skewness;
}
