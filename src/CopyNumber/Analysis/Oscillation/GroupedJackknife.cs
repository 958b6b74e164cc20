namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// The standard error of a statistic of replicates by the grouped (delete-a-group) jackknife (Efron &amp; Tibshirani
/// 1993, An Introduction to the Bootstrap, ch. 11): the replicates are split into g groups in order, the statistic
/// is recomputed g times without one group each, and SE² = (g − 1)/g · Σ (θ₋ᵢ − θ̄)². Replicates are independent, so
/// this holds for any smooth statistic (ratios, fitted slopes) without a formula of its own.
/// </summary>
public static class GroupedJackknife
{
    /// <summary>Groups used (fewer when there are fewer replicates).</summary>
    public const int Groups = 20;

    /// <summary>The jackknife standard error of <paramref name="statistic"/> over replicates 0 … <paramref name="replicates"/> − 1; NaN below 2 groups or when a leave-out value is not finite.</summary>
    /// <param name="replicates">How many replicates there are.</param>
    /// <param name="statistic">The statistic of the replicates the predicate keeps.</param>
    public static double StandardError(int replicates, Func<Func<int, bool>, double> statistic)
    {
        ArgumentNullException.ThrowIfNull(statistic);
        var groups = Math.Min(Groups, replicates);
        if (groups < 2) return double.NaN;
        var values = new double[groups];
        for (var g = 0; g < groups; g++)
        {
            var left = g;
            values[g] = statistic(r => r * groups / replicates != left);
            if (!double.IsFinite(values[g])) return double.NaN;
        }
        var mean = values.Average();
        return Math.Sqrt((groups - 1.0) / groups * values.Sum(v => (v - mean) * (v - mean)));
    }
}
