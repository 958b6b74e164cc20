namespace CopyNumber.Analysis;

/// <summary>
/// The discrete analogue of the Gaussian, T(k; t) = e^(−t)·I_k(t) on the integers k (I_k the modified
/// Bessel function of the first kind), with variance t (Lindeberg 1990, IEEE Trans. Pattern Anal. Mach.
/// Intell. 12:234, "Scale-space for discrete signals"). Smoothing a sequence with it never creates a new
/// local extremum, which is why the mode count uses it rather than a sampled Gaussian. It is also the
/// law of the difference of two independent Poisson(t/2) variables, hence log-concave.
/// </summary>
public sealed class DiscreteGaussianKernel
{
    private readonly double[] _halfKernel;

    /// <summary>Builds the kernel with standard deviation <paramref name="width"/> (t = width²), in copies.</summary>
    /// <exception cref="ArgumentOutOfRangeException">The width is not positive and finite.</exception>
    public DiscreteGaussianKernel(double width)
    {
        if (!(width > 0) || double.IsInfinity(width)) throw new ArgumentOutOfRangeException(nameof(width), "the kernel width must be positive and finite");
        Width = width;
        _halfKernel = HalfKernel(width * width);
    }

    /// <summary>Standard deviation of the kernel, in copies.</summary>
    public double Width { get; }

    /// <summary>Largest |k| kept; beyond it the kernel is below 1e-17 of its centre.</summary>
    public int Reach => _halfKernel.Length - 1;

    /// <summary>T(k; t); zero beyond <see cref="Reach"/>.</summary>
    public double this[int offset]
    {
        get
        {
            var k = Math.Abs(offset);
            return k < _halfKernel.Length ? _halfKernel[k] : 0.0;
        }
    }

    /// <summary>
    /// Convolves a sequence on consecutive integers with the kernel. The result is longer by
    /// <see cref="Reach"/> on each side, so no mass is lost at the ends: entry i of the result belongs to
    /// position i − Reach of the input.
    /// </summary>
    public double[] Smooth(ReadOnlySpan<double> sequence)
    {
        var reach = Reach;
        var result = new double[sequence.Length + 2 * reach];
        for (var i = 0; i < sequence.Length; i++)
        {
            var p = sequence[i];
            if (p == 0) continue;
            var centre = i + reach;
            result[centre] += p * _halfKernel[0];
            for (var k = 1; k <= reach; k++)
            {
                var w = p * _halfKernel[k];
                result[centre - k] += w;
                result[centre + k] += w;
            }
        }
        return result;
    }

    // Miller's backward recurrence I_{k−1}(t) = (2k/t)·I_k(t) + I_{k+1}(t), started far beyond the
    // kernel's reach and normalised by e^t = I_0(t) + 2·Σ_{k≥1} I_k(t) (Abramowitz & Stegun 1964,
    // 9.6.26 and 9.6.37): this gives e^(−t)·I_k(t) directly, with no overflow for large t.
    private static double[] HalfKernel(double t)
    {
        var width = Math.Sqrt(t);
        // I_k/I_0 ≈ exp(−k²/2t) for large t; 10·width + 20 lies far beyond the 1e-17 cut.
        var start = (int)Math.Ceiling(10 * width + 20);
        var values = new double[start + 1];
        double above = 0, current = 1e-280;
        values[start] = current;
        for (var k = start; k >= 1; k--)
        {
            var below = 2.0 * k / t * current + above;
            above = current;
            current = below;
            values[k - 1] = current;
            if (current > 1e250)
            {
                for (var q = k - 1; q <= start; q++) values[q] *= 1e-250;
                above *= 1e-250;
                current *= 1e-250;
            }
        }
        var sum = values[0];
        for (var k = 1; k <= start; k++) sum += 2 * values[k];
        for (var k = 0; k <= start; k++) values[k] /= sum;
        var reach = 0;
        while (reach < start && values[reach + 1] >= 1e-17 * values[0]) reach++;
        return values.AsSpan(0, reach + 1).ToArray();
    }
}
