namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// What the oscillation analysis tells the contrast about one quantity (docs/methods-analysis.md, section 7).
/// While the rate equations run on a limit cycle (<paramref name="OnCycle"/>) the ensemble mean is not compared with
/// them (the replicates dephase, so the mean flattens while each replicate keeps oscillating), the coefficient of
/// variation is not judged against the LNA, and extinction is tested only when the cycle's trough stays at or above the floor.
/// </summary>
/// <param name="OnCycle">The rate equations run on a limit cycle.</param>
/// <param name="Trough">The quantity's trough along the cycle, copies (NaN when not on a cycle or not a species).</param>
/// <param name="Verdict">The oscillation verdict (cycles with the rate equations, cycle lost to noise, noise-driven ringing), or null.</param>
public sealed record QuantityOscillation(bool OnCycle, double Trough, QuantityVerdict? Verdict);
