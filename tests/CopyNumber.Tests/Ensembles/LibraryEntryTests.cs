using CopyNumber.Ensembles;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Ensembles;

/// <summary>
/// The engine used from C# through its one short entry point, without files (issue 10: storage apart
/// from the engine), checked against the immigration–death process: from X(0) = 0 with immigration at
/// rate k and death at rate g per molecule, X(t) is Poisson with mean λ(t) = (k/g)(1 − e^{−gt})
/// (Bailey 1964, The Elements of Stochastic Processes, §7; quoted from memory).
/// </summary>
public class LibraryEntryTests
{
    private const string ImmigrationDeath =
        "# illustrative: a molecule made at a constant rate and lost one by one\n" +
        "species\n  X = 0\nparameters\n  k = 10\n  g = 1\nreactions\n  make: 0 -> X mass k\n  lose: X -> 0 mass g\n";

    [Fact]
    public void An_ensemble_from_model_text_matches_the_poisson_law_of_immigration_and_death()
    {
        var network = Simulate.Network(ImmigrationDeath, "immigration.cnet");
        const long replicates = 4000;
        var result = Simulate.Ensemble(network, new EnsembleOptions { Grid = new TimeGrid(2, 1), Replicates = replicates, Seed = 20261202, Threads = 2 });
        var lambda = 10 * (1 - Math.Exp(-2.0));
        var summary = DistributionSummary.From(result.Histogram(2, 0));
        Assert.Equal(replicates, result.ReplicatesFinished);
        // 4.5 standard errors: Poisson variance λ for the mean; (2λ² + λ)/n for the sample variance (Poisson
        // fourth central moment 3λ² + λ). A false failure has probability below 1e-5 per check; the seed is fixed.
        Assert.InRange(summary.Mean, lambda - 4.5 * Math.Sqrt(lambda / replicates), lambda + 4.5 * Math.Sqrt(lambda / replicates));
        var varianceError = Math.Sqrt((2 * lambda * lambda + lambda) / replicates);
        Assert.InRange(summary.Variance, lambda - 4.5 * varianceError, lambda + 4.5 * varianceError);

        // The rate equations of the same network: dx/dt = k − g x, x(t) = λ(t) exactly.
        var deterministic = Simulate.RateEquations(network, new TimeGrid(2, 1));
        Assert.Equal(lambda, deterministic.Values[2, 0], 1e-5);
    }

    [Fact]
    public void Model_text_with_a_mistake_raises_the_error_that_names_file_line_and_column()
    {
        var error = Assert.Throws<ModelInputException>(() => Simulate.Network("species\n  X = 0\nreactions\n  lose: X -> 0 mass nosuch\n", "broken.cnet"));
        Assert.StartsWith("broken.cnet:4:", error.Diagnostics[0].Format());
        Assert.Equal(ErrorKind.BadInput, error.Kind);
    }
}
