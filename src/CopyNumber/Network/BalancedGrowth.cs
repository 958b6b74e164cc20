namespace CopyNumber.Network;

/// <summary>
/// A culture of cells that follow a <see cref="CellCycle"/> in balanced exponential growth, what a snapshot
/// of the whole population (flow cytometry) sees (docs/methods.md "Growth and division", the population
/// snapshot). Each cell's cycle length is drawn at its birth from f (fixed, or gamma with mean T and CV c),
/// independently of everything else, so the cell number grows as e^(Λt) with Λ the root of the Euler–Lotka
/// equation 2∫e^(−Λτ) f(τ) dτ = 1 (Powell 1956, J. Gen. Microbiol. 15:492).
/// </summary>
/// <remarks>
/// <para>For the gamma law of shape k = 1/c² and scale θ = T·c², ∫e^(−Λτ) f(τ) dτ = (1 + Λθ)^(−k), so
/// Λ = (2^(c²) − 1)/(T·c²), and ln 2/T in the limit c → 0 (the fixed length).</para>
/// <para>Traced back from a cell taken at random from the culture, the ancestors' cycle lengths are
/// independent with the density 2e^(−Λτ) f(τ) (the ancestral law; short cycles are over-represented, since a
/// short cycle leaves more descendants), which for the gamma law is a gamma law of the same shape and the scale
/// θ/(1 + Λθ) = θ·2^(−c²): <see cref="AncestralScale"/>. The sampled cell itself has age a and cycle length τ
/// with the joint density Λ·2e^(−Λa) f(τ) 1{a &lt; τ}, whose age marginal for a fixed length is the
/// age density 2 ln 2/T·2^(−a/T).</para>
/// <para>Derivation (ours, following the many-to-one argument for branching processes): the expected number
/// of cells alive at time t with a given history is 2^(divisions along it) times the probability of that
/// history along one lineage; as t → ∞ the factor 2e^(−Λτ) per completed cycle becomes the ancestral law and
/// e^(−Λa) on the current cycle becomes the age weight. Since the lengths do not depend on the cell's
/// contents, a cell's contents given its history have the same law in the culture as along one lineage.</para>
/// </remarks>
public static class BalancedGrowth
{
    /// <summary>The population growth rate Λ (per model time unit): the Euler–Lotka root for the cycle's length law.</summary>
    public static double GrowthRate(CellCycle cycle)
    {
        ArgumentNullException.ThrowIfNull(cycle);
        var c2 = cycle.LengthCv * cycle.LengthCv;
        // (2^(c²) − 1)/c² → ln 2 as c → 0; for small c the series of e^x − 1 avoids the cancellation.
        var x = c2 * Math.Log(2);
        var expm1 = x < 1e-4 ? x * (1 + x / 2 * (1 + x / 3)) : Math.Exp(x) - 1;
        return c2 == 0 ? Math.Log(2) / cycle.MeanLength : expm1 / (c2 * cycle.MeanLength);
    }

    /// <summary>
    /// The factor that turns a draw of the cycle's length law into a draw of the ancestral law 2e^(−Λτ) f(τ):
    /// 2^(−c²) for the gamma law (same shape, scale θ·2^(−c²)), 1 for a fixed length.
    /// </summary>
    public static double AncestralScale(CellCycle cycle)
    {
        ArgumentNullException.ThrowIfNull(cycle);
        return Math.Pow(2, -cycle.LengthCv * cycle.LengthCv);
    }

    /// <summary>
    /// The weight of a record at age <paramref name="age"/> of an ancestral-law cycle of length <paramref name="length"/>,
    /// the age drawn uniformly on [0, length): the snapshot's density Λ·2e^(−Λa) f(τ) over the proposal's
    /// 2e^(−Λτ) f(τ)/τ, i.e. Λ·τ·e^(Λ(τ − a)), whose mean under the proposal is 1. For a fixed length T it is
    /// 2 ln 2·2^(−a/T), the age density over the uniform 1/T.
    /// </summary>
    public static double SnapshotWeight(double growthRate, double age, double length) =>
        growthRate * length * Math.Exp(growthRate * (length - age));
}
