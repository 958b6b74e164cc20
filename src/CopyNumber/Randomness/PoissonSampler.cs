namespace CopyNumber.Randomness;

/// <summary>Poisson variates for tau-leaping.</summary>
public static class PoissonSampler
{
    /// <summary>A Poisson variate with the given mean (≥ 0). Placeholder: the sampler is being written.</summary>
    public static long Sample(ref Xoshiro256StarStar rng, double mean) =>
        throw new NotImplementedException("Poisson sampler not written yet");
}
