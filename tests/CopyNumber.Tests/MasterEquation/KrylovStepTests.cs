using CopyNumber.MasterEquation;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// One step of the Krylov exponential on a fixed projection, against the law known in closed form. Immigration–death
/// 0 → X (k), X → 0 (μ) started at X = 0 is Poisson with mean (k/μ)(1 − e^{−μt}) at every t (Bailey 1964, The
/// Elements of Stochastic Processes with Applications to the Natural Sciences, Wiley; quoted from memory). On the
/// projection {0, …, 120} with mean at most 40 the probability that would leave it is below 10⁻¹⁸, so the projected
/// exponential equals the Poisson law to round-off and the step's own error is all that separates them.
/// </summary>
public sealed class KrylovStepTests
{
    private const double K = 40, Mu = 1;

    /// <summary>
    /// Sidje's step-size formula (Sidje 1998, ACM Trans. Math. Softw. 24:130) grows a step by at most
    /// (τ·tol/err)^{1/m}, under 1.1 for m = 60, so a step started short stays short although the basis carries the
    /// whole stretch. The step lengthens with the basis it has already paid for: asked for at most half a time unit from a
    /// suggestion of 10⁻³, it takes the whole half unit, and the result is the Poisson law within the step's estimate.
    /// </summary>
    [Fact]
    public void AStepStartedShortTakesTheWholeStretchTheBasisCarries()
    {
        var network = ExactModels.ImmigrationDeath(K, Mu);
        var space = new StateSpace(StateCoding.For(network));
        for (var x = 0; x <= 120; x++) space.Add([x]);
        var parameters = network.InitialParameterValues.ToArray();
        var constants = new double[network.Reactions.Count];
        network.Propensities.ComputeConstants(parameters, constants);
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = 1 };
        var generator = Generator.Build(space, network, constants, parameters, parallel);
        var start = new double[space.Count];
        start[space.IndexOf([0])] = 1;
        var result = new double[space.Count];
        const double errorPerTime = 1e-9;

        var (step, error, _) = new KrylovExponential(parallel).Step(generator, start, longest: 0.5, suggested: 1e-3, errorPerTime, result);

        Assert.Equal(0.5, step);
        Assert.True(error <= errorPerTime * step, $"estimate {error:G3}");
        var mean = K / Mu * (1 - Math.Exp(-Mu * step));
        var distance = 0.0;
        for (var x = 0; x <= 120; x++) distance += Math.Abs(result[space.IndexOf([x])] - ExactModels.Poisson(mean, x));
        // The estimate is a-posteriori (not a proof); a factor of ten above it is still far below the step's allowance of 10⁻⁹.
        Assert.True(distance <= 10 * errorPerTime + 1e-12, $"‖p − Poisson‖₁ = {distance:G3}, estimate {error:G3}");
    }
}
