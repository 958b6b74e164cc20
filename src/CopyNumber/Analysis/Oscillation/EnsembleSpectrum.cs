using System.Numerics;
using MathNet.Numerics.IntegralTransforms;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// The power spectrum and autocorrelation of one species, averaged over the sample's replicates.
/// Per replicate the path y (M points, step Δ) is centred on its Hann-weighted mean, multiplied by the Hann window w,
/// and its periodogram is P(ω_k) = Δ·|Σ_j w_j y_j e^(−iω_k jΔ)|² / Σ_j w_j², ω_k = 2πk/(MΔ), k = 0 … M/2: an estimate
/// of the two-sided spectrum S(ω) = ∫ Cov(x(t), x(t + τ)) e^(−iωτ) dτ, so that ∫ S dω/2π is the variance (the convention of
/// <see cref="LnaSpectrum"/>). The window's leakage smooths S over about 4π/(MΔ), so the sample's window holds at least
/// <see cref="OscillationSample.WindowDampingTimes"/> damping times (a peak of half-width 1/τ is then resolved; Priestley
/// 1981, Spectral Analysis and Time Series, §6.2; quoted from memory). The autocorrelation is the replicates' mean of
/// Σ_j y_j y_{j+ℓ}/(M − ℓ) over their mean variance, lags up to M/2. Standard errors: the spread between replicates over √n.
/// </summary>
/// <param name="Frequencies">ω_k in radians per time unit.</param>
/// <param name="Power">The replicates' mean periodogram, copies² × time.</param>
/// <param name="PowerError">Its standard error.</param>
/// <param name="Lags">Autocorrelation lags, time units.</param>
/// <param name="Autocorrelation">The averaged autocorrelation (1 at lag 0).</param>
/// <param name="Peak">The coherent-peak test's outcome.</param>
public sealed record EnsembleSpectrum(double[] Frequencies, double[] Power, double[] PowerError, double[] Lags, double[] Autocorrelation, SpectralPeak Peak)
{
    /// <summary>The lowest frequency index a peak is looked for at and the reference index below it (bins 0 and 1 carry the removed mean).</summary>
    public const int ReferenceBin = 2, FirstPeakBin = 3;

    /// <summary>Averages the replicates' periodograms and autocorrelations and tests for a coherent peak at false-alarm rate <paramref name="alpha"/>.</summary>
    public static EnsembleSpectrum Of(double[][] paths, double step, double alpha)
    {
        ArgumentNullException.ThrowIfNull(paths);
        var n = paths.Length;
        var m = paths[0].Length;
        var bins = m / 2 + 1;
        var window = Enumerable.Range(0, m).Select(j => 0.5 - 0.5 * Math.Cos(2 * Math.PI * j / (m - 1))).ToArray();
        var windowSquares = window.Sum(w => w * w);
        var windowSum = window.Sum();
        var lags = m / 2;
        var periodograms = new double[n][];
        var covariances = new double[n][];
        var buffer = new Complex[m];
        for (var r = 0; r < n; r++)
        {
            var y = paths[r];
            var centre = 0.0;
            for (var j = 0; j < m; j++) centre += window[j] * y[j];
            centre /= windowSum;
            for (var j = 0; j < m; j++) buffer[j] = new Complex(window[j] * (y[j] - centre), 0);
            Fourier.Forward(buffer, FourierOptions.NoScaling);
            periodograms[r] = Enumerable.Range(0, bins).Select(k => step * buffer[k].Magnitude * buffer[k].Magnitude / windowSquares).ToArray();
            var mean = y.Average();
            var cov = new double[lags + 1];
            for (var l = 0; l <= lags; l++)
            {
                var sum = 0.0;
                for (var j = 0; j + l < m; j++) sum += (y[j] - mean) * (y[j + l] - mean);
                cov[l] = sum / (m - l);
            }
            covariances[r] = cov;
        }
        var power = new double[bins];
        var error = new double[bins];
        for (var k = 0; k < bins; k++) (power[k], error[k]) = MeanAndError(periodograms, k);
        var variance = covariances.Average(c => c[0]);
        var autocorrelation = Enumerable.Range(0, lags + 1).Select(l => variance > 0 ? covariances.Average(c => c[l]) / variance : double.NaN).ToArray();
        var frequencies = Enumerable.Range(0, bins).Select(k => 2 * Math.PI * k / (m * step)).ToArray();
        var peak = SpectralPeak.Test(periodograms, frequencies, alpha);
        return new EnsembleSpectrum(frequencies, power, error, Enumerable.Range(0, lags + 1).Select(l => l * step).ToArray(), autocorrelation, peak);
    }

    internal static (double Mean, double Error) MeanAndError(double[][] values, int k)
    {
        var n = values.Length;
        var mean = 0.0;
        for (var r = 0; r < n; r++) mean += values[r][k];
        mean /= n;
        var ss = 0.0;
        for (var r = 0; r < n; r++) ss += (values[r][k] - mean) * (values[r][k] - mean);
        return (mean, n > 1 ? Math.Sqrt(ss / (n - 1) / n) : double.NaN);
    }
}

/// <summary>
/// Whether the averaged spectrum has a coherent peak away from 0. H₀: S(ω_k) ≤ S(ω_ref) at every k ≥
/// <see cref="EnsembleSpectrum.FirstPeakBin"/> (a spectrum that does not rise above its low-frequency level, as every
/// single-species spectrum of a linear network with real eigenvalues does not, e.g. the Lorentzian of a birth–death
/// process). Per bin the paired differences d_r = P_r(ω_k) − P_r(ω_ref) over replicates give u_k = d̄/SE(d̄); the peak is
/// declared when max_k u_k exceeds z = Φ⁻¹(1 − α/m) over the m bins tested (Bonferroni: a false-alarm rate ≤ α whatever
/// the dependence between bins; normal approximation of a mean of n independent replicates).
/// </summary>
/// <param name="Found">True when H₀ is rejected.</param>
/// <param name="Frequency">The frequency of the highest averaged power among k ≥ the first bin, radians per time unit.</param>
/// <param name="Statistic">The largest u_k.</param>
/// <param name="Threshold">The Bonferroni z.</param>
/// <param name="Ratio">The averaged power at the peak over that at the reference bin.</param>
public sealed record SpectralPeak(bool Found, double Frequency, double Statistic, double Threshold, double Ratio)
{
    /// <summary>The peak's period 2π/ω.</summary>
    public double Period => 2 * Math.PI / Frequency;

    internal static SpectralPeak Test(double[][] periodograms, double[] frequencies, double alpha)
    {
        var bins = frequencies.Length;
        var n = periodograms.Length;
        var reference = EnsembleSpectrum.ReferenceBin;
        var tested = bins - EnsembleSpectrum.FirstPeakBin;
        if (tested < 1 || n < 2) return new SpectralPeak(false, double.NaN, double.NaN, double.NaN, double.NaN);
        var z = MathNet.Numerics.Distributions.Normal.InvCDF(0, 1, 1 - alpha / tested);
        var best = double.NegativeInfinity;
        var top = EnsembleSpectrum.FirstPeakBin;
        var topPower = double.NegativeInfinity;
        var referencePower = periodograms.Average(p => p[reference]);
        var differences = new double[n][];
        for (var r = 0; r < n; r++) differences[r] = new double[1];
        for (var k = EnsembleSpectrum.FirstPeakBin; k < bins; k++)
        {
            for (var r = 0; r < n; r++) differences[r][0] = periodograms[r][k] - periodograms[r][reference];
            var (mean, error) = EnsembleSpectrum.MeanAndError(differences, 0);
            var u = error > 0 ? mean / error : mean > 0 ? double.PositiveInfinity : 0;
            best = Math.Max(best, u);
            var power = mean + referencePower;
            if (power > topPower) { topPower = power; top = k; }
        }
        return new SpectralPeak(best > z, frequencies[top], best, z, referencePower > 0 ? topPower / referencePower : double.PositiveInfinity);
    }
}
