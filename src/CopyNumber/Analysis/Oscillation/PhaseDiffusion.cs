namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// The coherence time of an oscillation, defined as 1/D with D the phase diffusion constant (Var θ(t) grows as 2Dt):
/// for a phase θ = ωt + √(2D)·W(t), ⟨cos θ(t)⟩ = cos(ωt)·e^(−Dt), so 1/D is also the decay time of the envelope of the
/// ensemble-averaged autocorrelation, and the time after which the replicates' phases have spread by one radian
/// (each in its own direction). Estimator: the time t_{j+m} − t_j spanned by m successive cycles has variance
/// a + b·m, where b = 2D·T³/(2π)² is the variance one cycle adds (the first-passage time of a drifting Brownian phase
/// over 2π; Gardiner 2009, Stochastic Methods, §5.2; quoted from memory) and a the jitter of locating the two crossings.
/// b is the least-squares slope over m = 1 … m_max (pooled over replicates and start cycles), so the crossing jitter
/// does not bias it; then 1/D = T³/(2π²·b).
/// </summary>
public static class PhaseDiffusion
{
    /// <summary>At most this many cycles are spanned by one difference.</summary>
    public const int MaximumSpan = 6;

    /// <summary>The coherence time 1/D in model time units; +∞ when the spans' variance does not grow (coherent beyond the window), NaN without enough cycles.</summary>
    /// <param name="cycles">The replicates' cycles.</param>
    /// <param name="keep">Which replicates to use (for the jackknife).</param>
    public static double CoherenceTime(IReadOnlyList<ReplicateCycles> cycles, Func<int, bool>? keep = null)
    {
        ArgumentNullException.ThrowIfNull(cycles);
        var used = Enumerable.Range(0, cycles.Count).Where(r => keep is null || keep(r)).Select(r => cycles[r]).Where(c => c.Count >= 2).ToArray();
        if (used.Length < 2) return double.NaN;
        var typicalCycles = used.Select(c => c.Count).OrderBy(n => n).ElementAt(used.Length / 2);
        var span = Math.Min(MaximumSpan, typicalCycles - 1);
        if (span < 2) return double.NaN;
        var period = used.Sum(c => c.Starts[^1] - c.Starts[0]) / used.Sum(c => c.Count);
        var ms = new List<double>();
        var variances = new List<double>();
        for (var m = 1; m <= span; m++)
        {
            var spans = used.SelectMany(c => Enumerable.Range(0, Math.Max(0, c.Starts.Length - m)).Select(j => c.Starts[j + m] - c.Starts[j])).ToArray();
            if (spans.Length < 2) break;
            var mean = spans.Average();
            ms.Add(m);
            variances.Add(spans.Sum(s => (s - mean) * (s - mean)) / (spans.Length - 1));
        }
        if (ms.Count < 2) return double.NaN;
        var mBar = ms.Average();
        var vBar = variances.Average();
        var slope = ms.Zip(variances).Sum(p => (p.First - mBar) * (p.Second - vBar)) / ms.Sum(m => (m - mBar) * (m - mBar));
        return slope > 0 ? period * period * period / (2 * Math.PI * Math.PI * slope) : double.PositiveInfinity;
    }
}
