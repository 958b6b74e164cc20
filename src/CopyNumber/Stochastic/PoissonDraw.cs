using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>A Poisson variate with the given mean (≥ 0) from the generator; <see cref="PoissonSampler.Sample"/> in production.</summary>
internal delegate long PoissonDraw(ref Xoshiro256StarStar rng, double mean);
