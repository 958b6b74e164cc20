namespace CopyNumber.Analysis;

/// <summary>What a verdict says about a quantity; several may apply at once.</summary>
public enum VerdictKind
{
    /// <summary>No criterion fired: the rate equations describe this quantity well.</summary>
    Adequate,
    /// <summary>The ensemble mean departs from the rate equations by more than the threshold, resolved by the sampling error.</summary>
    MeanShifted,
    /// <summary>Fluctuations are as large as a sizeable fraction of the mean late in the run.</summary>
    NoiseDominated,
    /// <summary>The distribution has two or more modes, which one mean cannot describe.</summary>
    Multimodal,
    /// <summary>A noticeable share of replicates is at 0 at the end while the rate equations are not.</summary>
    ExtinctionProne,
    /// <summary>Too few replicates to judge; no other verdict is given.</summary>
    TooFewReplicates,
    /// <summary>The rate equations run on a limit cycle and the replicates oscillate with them (a coherent spectral peak); their periods and amplitudes are compared.</summary>
    CyclesWithRateEquations,
    /// <summary>The rate equations run on a limit cycle but the ensemble's spectrum shows no coherent peak.</summary>
    CycleLostToNoise,
    /// <summary>The rate equations settle, but the replicates ring: a coherent spectral peak (quasi-cycles).</summary>
    NoiseDrivenRinging,
}

/// <summary>One verdict on one quantity, with a plain sentence giving the numbers and the threshold.</summary>
/// <param name="Quantity">The species or readout name.</param>
/// <param name="Kind">What the verdict says.</param>
/// <param name="Sentence">One sentence, e.g. "ensemble mean 15% (±2%) above the rate equations from t = 40 on; threshold 5%".</param>
public sealed record QuantityVerdict(string Quantity, VerdictKind Kind, string Sentence)
{
    /// <summary>The verdict's label as written in reports: "adequate", "mean shifted", "noise-dominated", "multimodal", "extinction-prone", "too few replicates", "cycles with the rate equations", "cycle lost to noise", "noise-driven ringing".</summary>
    public string Label => LabelOf(Kind);

    /// <summary>The label of a verdict kind.</summary>
    public static string LabelOf(VerdictKind kind) => kind switch
    {
        VerdictKind.Adequate => "adequate",
        VerdictKind.MeanShifted => "mean shifted",
        VerdictKind.NoiseDominated => "noise-dominated",
        VerdictKind.Multimodal => "multimodal",
        VerdictKind.ExtinctionProne => "extinction-prone",
        VerdictKind.CyclesWithRateEquations => "cycles with the rate equations",
        VerdictKind.CycleLostToNoise => "cycle lost to noise",
        VerdictKind.NoiseDrivenRinging => "noise-driven ringing",
        _ => "too few replicates",
    };
}
