namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// One species' oscillation in the sample: per-replicate periods and amplitudes (<see cref="ReplicateCycles"/>), their
/// means with standard errors and spreads, the coherence time (<see cref="PhaseDiffusion"/>) with its grouped-jackknife
/// standard error, the averaged spectrum and autocorrelation (<see cref="EnsembleSpectrum"/>), and the LNA spectrum at the
/// same frequencies where the rate equations settle to a stable steady state.
/// </summary>
public sealed record SpeciesOscillation(
    string Species,
    IReadOnlyList<ReplicateCycles> Cycles,
    EnsembleSpectrum Spectrum,
    double[]? LnaPower)
{
    /// <summary>Replicates with at least two complete cycles (the others have no period).</summary>
    public int ReplicatesWithPeriod => Cycles.Count(c => c.Count >= 2);

    /// <summary>Mean, standard error and standard deviation of the replicates' periods, model time units.</summary>
    public (double Mean, double Error, double Spread) Period => Summary(Cycles.Select(c => c.Period));

    /// <summary>Mean, standard error and standard deviation of the replicates' amplitudes, copies.</summary>
    public (double Mean, double Error, double Spread) Amplitude => Summary(Cycles.Select(c => c.Amplitude));

    /// <summary>The coherence time 1/D and its grouped-jackknife standard error, model time units.</summary>
    public (double Value, double Error) CoherenceTime
    {
        get
        {
            var value = PhaseDiffusion.CoherenceTime(Cycles);
            var error = double.IsFinite(value) ? GroupedJackknife.StandardError(Cycles.Count, keep => PhaseDiffusion.CoherenceTime(Cycles, keep)) : double.NaN;
            return (value, error);
        }
    }

    /// <summary>Analyses species <paramref name="index"/> of <paramref name="sample"/>; <paramref name="lna"/> adds the LNA spectrum.</summary>
    public static SpeciesOscillation Of(string species, int index, OscillationSample sample, double alpha, LnaSpectrum? lna)
    {
        ArgumentNullException.ThrowIfNull(sample);
        var paths = sample.Paths[index];
        var cycles = paths.Select(p => ReplicateCycles.Of(p, sample.Step)).ToArray();
        var spectrum = EnsembleSpectrum.Of(paths, sample.Step, alpha);
        return new SpeciesOscillation(species, cycles, spectrum, lna?.Of(index, spectrum.Frequencies));
    }

    private static (double Mean, double Error, double Spread) Summary(IEnumerable<double> values)
    {
        var x = values.Where(double.IsFinite).ToArray();
        if (x.Length < 2) return (x.Length == 1 ? x[0] : double.NaN, double.NaN, double.NaN);
        var mean = x.Average();
        var sd = Math.Sqrt(x.Sum(v => (v - mean) * (v - mean)) / (x.Length - 1));
        return (mean, sd / Math.Sqrt(x.Length), sd);
    }
}
