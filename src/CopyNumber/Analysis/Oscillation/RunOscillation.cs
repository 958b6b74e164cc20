using CopyNumber.Network;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>The oscillation analysis of a run: the rate equations' behaviour and, when it calls for one, the sample's per-species analysis.</summary>
/// <param name="RateEquations">What the rate equations do.</param>
/// <param name="Sample">The recorded sample paths, or null when none was wanted.</param>
/// <param name="Species">One analysis per species (empty without a sample).</param>
/// <param name="Note">Why there is no sample, or null.</param>
public sealed record RunOscillation(RateEquationOscillation RateEquations, OscillationSample? Sample, IReadOnlyList<SpeciesOscillation> Species, string? Note)
{
    /// <summary>
    /// Detects the rate equations' oscillation and, when they oscillate or ring, records and analyses the sample
    /// (<see cref="OscillationSample"/>) at false-alarm rate <paramref name="alpha"/> per species.
    /// </summary>
    public static RunOscillation Analyse(ReactionNetwork network, double until, long replicates, ulong seed, int threads, double alpha, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        var rateEquations = CycleDetection.DetectForRun(network, until);
        if (!OscillationSample.Wanted(rateEquations))
            return new RunOscillation(rateEquations, null, [], "no sample paths recorded: the rate equations neither oscillate nor have complex eigenvalues");
        var sample = OscillationSample.Record(network, rateEquations, until, replicates, seed, threads, cancel);
        return FromSample(network, rateEquations, sample, alpha);
    }

    /// <summary>Analyses an already recorded <paramref name="sample"/> (tests, and callers that record their own).</summary>
    public static RunOscillation FromSample(ReactionNetwork network, RateEquationOscillation rateEquations, OscillationSample sample, double alpha)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(sample);
        if (sample.Replicates < 2 || sample.Paths[0][0].Length < OscillationSample.MinimumPoints)
            return new RunOscillation(rateEquations, sample, [], $"the sample holds {sample.Replicates} complete replicates of {(sample.Replicates > 0 ? sample.Paths[0][0].Length : 0)} points: too few to analyse");
        var lna = rateEquations.Kind != OscillationKind.LimitCycle && rateEquations.SteadyState.Count == network.Species.Count
            ? new LnaSpectrum(network, rateEquations.SteadyState) : null;
        var species = network.Species.Select((name, i) => SpeciesOscillation.Of(name, i, sample, alpha, lna)).ToArray();
        return new RunOscillation(rateEquations, sample, species, null);
    }

    /// <summary>The analysis of species <paramref name="name"/>, or null.</summary>
    public SpeciesOscillation? For(string name) => Species.FirstOrDefault(s => s.Species == name);
}
