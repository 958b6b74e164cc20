namespace CopyNumber.Ensembles;

/// <summary>
/// The complete state of a <see cref="MomentAccumulator"/>: restoring it gives an accumulator that
/// behaves bit for bit like the original, so stored runs can be resumed and merged exactly.
/// </summary>
/// <param name="Count">Finite values added, ≥ 0.</param>
/// <param name="NonFiniteCount">NaN or infinite values offered and left out, ≥ 0.</param>
/// <param name="Mean">The running mean; 0 when <paramref name="Count"/> is 0.</param>
/// <param name="SquaredDeviations">The running Σ(x − mean)², ≥ 0; 0 when <paramref name="Count"/> is 0.</param>
/// <param name="Minimum">The smallest finite value; +∞ when <paramref name="Count"/> is 0.</param>
/// <param name="Maximum">The largest finite value; −∞ when <paramref name="Count"/> is 0.</param>
public readonly record struct MomentState(long Count, long NonFiniteCount, double Mean, double SquaredDeviations, double Minimum, double Maximum)
{
    /// <summary>Why this cannot be an accumulator's state, or null when it can.</summary>
    public string? Problem()
    {
        if (Count < 0 || NonFiniteCount < 0) return "a count is negative";
        if (Count == 0)
        {
            return Mean == 0 && SquaredDeviations == 0 && double.IsPositiveInfinity(Minimum) && double.IsNegativeInfinity(Maximum)
                ? null
                : "an empty accumulator must have mean 0, no squared deviations, minimum +∞ and maximum −∞";
        }
        if (!double.IsFinite(Mean) || !double.IsFinite(SquaredDeviations) || !double.IsFinite(Minimum) || !double.IsFinite(Maximum))
            return "a moment of finite values is not finite";
        if (SquaredDeviations < 0) return "the squared deviations are negative";
        if (Minimum > Maximum) return "the minimum exceeds the maximum";
        return null;
    }
}
