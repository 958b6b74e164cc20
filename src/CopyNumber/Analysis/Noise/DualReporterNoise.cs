namespace CopyNumber.Analysis.Noise;

/// <summary>
/// Intrinsic and extrinsic noise from two identical, independent reporters in one cell (two copies of a gene
/// under the same control), by the identities of Elowitz, Levine, Siggia &amp; Swain (2002, Science 297:1183):
/// with reporter counts c and y in the same replicate,
/// η²_int = ⟨(c − y)²⟩ / (2⟨c⟩⟨y⟩) and η²_ext = (⟨c·y⟩ − ⟨c⟩⟨y⟩) / (⟨c⟩⟨y⟩),
/// which add up to the squared coefficient of variation of either reporter when the two are identical
/// (Swain, Elowitz &amp; Siggia 2002, PNAS 99:12795). Everything needed is in an ensemble's moments and the
/// covariance of the pair: ⟨(c − y)²⟩ = Var c + Var y − 2 Cov(c, y) + (⟨c⟩ − ⟨y⟩)².
/// </summary>
/// <remarks>
/// Standard errors by the delta method under normal theory: the sample variance of d = c − y has standard
/// error Var d·√(2/(n − 1)), the covariance its own normal-theory error, and the product of the means a
/// relative error √(Var c/(n⟨c⟩²) + Var y/(n⟨y⟩²)) (common practice). For counts far from normal (a few copies
/// on average) the errors are approximate; they do not enter a verdict.
/// </remarks>
public static class DualReporterNoise
{
    /// <summary>The split at one time from the two reporters' moments and their covariance.</summary>
    /// <param name="replicates">n, replicates behind the moments (at least 2).</param>
    /// <param name="meanC">⟨c⟩, copies.</param>
    /// <param name="varianceC">Var c (unbiased), copies².</param>
    /// <param name="meanY">⟨y⟩, copies.</param>
    /// <param name="varianceY">Var y, copies².</param>
    /// <param name="covariance">Cov(c, y) (unbiased), copies².</param>
    /// <param name="covarianceError">The covariance's standard error, copies².</param>
    /// <returns>The split; NaN parts where a mean is not positive or n &lt; 2.</returns>
    public static DualReporterPoint At(long replicates, double meanC, double varianceC, double meanY, double varianceY, double covariance, double covarianceError)
    {
        var scale = meanC * meanY;
        if (replicates < 2 || !(meanC > 0) || !(meanY > 0))
            return new DualReporterPoint(double.NaN, double.NaN, double.NaN, double.NaN);
        var n = (double)replicates;
        var differenceVariance = Math.Max(0.0, varianceC + varianceY - 2 * covariance);
        var gap = meanC - meanY;
        var intrinsic = (differenceVariance + gap * gap) / (2 * scale);
        var extrinsic = covariance / scale;
        var scaleRelativeError = Math.Sqrt(varianceC / (n * meanC * meanC) + varianceY / (n * meanY * meanY));
        var intrinsicError = Math.Sqrt(Square(differenceVariance * Math.Sqrt(2 / (n - 1)) / (2 * scale)) + Square(intrinsic * scaleRelativeError));
        var extrinsicError = Math.Sqrt(Square(covarianceError / scale) + Square(extrinsic * scaleRelativeError));
        return new DualReporterPoint(intrinsic, intrinsicError, extrinsic, extrinsicError);
    }

    private static double Square(double x) => x * x;
}

/// <summary>The dual-reporter split at one time: squared coefficients of variation, each with its standard error.</summary>
/// <param name="Intrinsic">η²_int, dimensionless.</param>
/// <param name="IntrinsicError">Its standard error.</param>
/// <param name="Extrinsic">η²_ext, dimensionless; may fall below 0 by sampling error when it is small.</param>
/// <param name="ExtrinsicError">Its standard error.</param>
public readonly record struct DualReporterPoint(double Intrinsic, double IntrinsicError, double Extrinsic, double ExtrinsicError);

/// <summary>One pair of reporters' split at every grid time of a run.</summary>
/// <param name="First">The first reporter (species name).</param>
/// <param name="Second">The second reporter.</param>
/// <param name="Points">The split at each grid time, aligned with the run's times.</param>
public sealed record DualReporterSplit(string First, string Second, IReadOnlyList<DualReporterPoint> Points);
