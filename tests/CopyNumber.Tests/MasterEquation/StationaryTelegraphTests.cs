using CopyNumber.MasterEquation;
using CopyNumber.Network;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// The telegraph promoter (off ⇄ on at k_on, k_off; on → on + m at k_tx; m → 0 at δ): its stationary
/// mRNA law is P(n) = λⁿ/n! · (a)_n/(a+b)_n · ₁F₁(a+n; a+b+n; −λ) with a = k_on/δ, b = k_off/δ,
/// λ = k_tx/δ (Peccoud &amp; Ycart 1995, Theor. Popul. Biol. 48:222). Computed here independently, with
/// Kummer's transformation ₁F₁(α; β; −λ) = e^{−λ}·₁F₁(β−α; β; λ) (Abramowitz &amp; Stegun 1964, 13.1.27)
/// so that the series has positive terms only.
/// </summary>
public sealed class StationaryTelegraphTests
{
    [Theory]
    [InlineData(0.5, 1.0, 20.0, 1.0)]   // bursty: the promoter is mostly off
    [InlineData(0.2, 0.1, 10.0, 0.5)]   // slow switching: a bimodal mRNA law
    public void StationaryMrnaLawIsPeccoudYcart(double kOn, double kOff, double kTx, double decay)
    {
        var network = ExactModels.Telegraph(kOn, kOff, kTx, decay);
        var (_, stationary) = StationarySolver.Solve(network, new TimeGrid(until: 60, every: 5), new ExactOptions(1e-9), residualTolerance: 1e-12);
        Assert.True(stationary.Residual <= 1e-12, $"residual {stationary.Residual:G3}");
        Assert.True(stationary.BoundaryMass < 1e-8, $"boundary mass {stationary.BoundaryMass:G3}");
        var law = stationary.Laws[network.SpeciesIndex("m")].Distribution!;
        var computed = law.Values.Zip(law.Probabilities).ToDictionary(p => p.First, p => p.Second);
        double a = kOn / decay, b = kOff / decay, lambda = kTx / decay;
        var distance = 0.0;
        for (long n = 0; n <= 400; n++) distance += Math.Abs(PeccoudYcart(n, a, b, lambda) - computed.GetValueOrDefault(n));
        Assert.True(distance < 1e-7, $"total variation ×2 from the Peccoud–Ycart law: {distance:G3}");
    }

    /// <summary>The Peccoud–Ycart probability of n mRNA.</summary>
    private static double PeccoudYcart(long n, double a, double b, double lambda)
    {
        // Σ_m (b)_m / (a+b+n)_m · λ^m / m!, term by term.
        double sum = 0, term = 1;
        for (var m = 0; m < 10_000 && (m < 10 || term > 1e-18 * sum); m++)
        {
            sum += term;
            term *= (b + m) / (a + b + n + m) * lambda / (m + 1);
        }
        var logPrefactor = n * Math.Log(lambda) - ExactModels.LogGamma(n + 1)
            + ExactModels.LogGamma(a + n) - ExactModels.LogGamma(a) + ExactModels.LogGamma(a + b) - ExactModels.LogGamma(a + b + n) - lambda;
        return Math.Exp(logPrefactor) * sum;
    }
}
