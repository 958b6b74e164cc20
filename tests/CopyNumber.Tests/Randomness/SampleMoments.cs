namespace CopyNumber.Tests.Randomness;

/// <summary>Plain two-pass sample moments, the textbook definition, as an independent reference.</summary>
internal static class SampleMoments
{
    /// <summary>Mean and unbiased variance by the two-pass formula (Chan, Golub &amp; LeVeque 1983, eq. 1.2).</summary>
    public static (double Mean, double Variance) MeanAndVariance(IReadOnlyList<double> values)
    {
        var sum = 0.0;
        foreach (var value in values) sum += value;
        var mean = sum / values.Count;
        var squares = 0.0;
        foreach (var value in values) squares += (value - mean) * (value - mean);
        return (mean, squares / (values.Count - 1));
    }

    /// <summary>Mean and unbiased variance of integer draws, shifted by <paramref name="shift"/> before squaring.</summary>
    public static (double Mean, double Variance) MeanAndVariance(IReadOnlyList<long> values, double shift)
    {
        var shifted = new double[values.Count];
        for (var i = 0; i < shifted.Length; i++) shifted[i] = values[i] - shift;
        var (mean, variance) = MeanAndVariance(shifted);
        return (mean + shift, variance);
    }
}
