using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.Ensembles;

/// <summary>
/// The control ensemble of the partitioning noise (<see cref="PartitionControl"/>) on the stable protein of
/// <see cref="CellCycleTests"/> (made per gene copy and with the volume, never degraded, binomial split), at birth
/// after 6 divisions from P = 50. Exact values computed here, apart from the engine: under binomial partitioning the
/// birth-to-birth map μ' = (μ + λ)/2, σ²' = (σ² + λ)/4 + (μ + λ)/4 (law of total variance; Huh &amp; Paulsson 2011,
/// Nat. Genet. 43:95); under exact halving the law at birth carried as a probability vector (both from
/// CellCycleTests). The difference of the two variances is what binomial partitioning adds beyond halving; for
/// this linear network it is also the LNA's partitioning part minus the propagated parity term ¼·P(N odd).
/// </summary>
public sealed class PartitionControlTests
{
    private const int Divisions = 6;
    private const double T = 40;

    [Fact]
    public void TheControlEstimatesTheVarianceThatBinomialPartitioningAdds()
    {
        var network = CellCycleTests.Network();
        var (options, _, estimate) = AtBirth(network, 6_000, 2011);
        var last = options.Grid.Count - 1;

        var lambda = CellCycleTests.Produced(T, "exponential");
        var (_, binomialVariance) = CellCycleTests.BirthMoments(Divisions, lambda);
        var law = CellCycleTests.BirthLaw(Divisions, lambda, binomial: false);
        var halvesMean = law.Select((pr, n) => pr * n).Sum();
        double Central(int power) => law.Select((pr, n) => pr * Math.Pow(n - halvesMean, power)).Sum();
        var halvesVariance = Central(2);
        var added = binomialVariance - halvesVariance;

        // Tolerance: 5 standard errors of the difference (the two ensembles are independent); fixed seeds.
        Assert.True(Math.Abs(estimate.Added - added) < 5 * estimate.AddedStandardError,
            $"added {estimate.Added:G5} ± {estimate.AddedStandardError:G3}, exact {added:G5}");
        Assert.True(estimate.AddedStandardError < 0.05 * added, "resolved to better than 5%");
        Assert.True(Math.Abs(estimate.Share - added / binomialVariance) < 5 * estimate.ShareStandardError,
            $"share {estimate.Share:G4} ± {estimate.ShareStandardError:G3}, exact {added / binomialVariance:G4}");
        // The control's own standard error against the exact one from the law's fourth moment, √((μ₄ − σ⁴(n − 3)/(n − 1))/n)
        // (common practice; Cramér 1946, quoted from memory): the estimate's own error at n = 6 000 is a few per cent.
        var n = (double)estimate.Control.Replicates;
        var exactError = Math.Sqrt((Central(4) - halvesVariance * halvesVariance * (n - 3) / (n - 1)) / n);
        Assert.InRange(estimate.Control.StandardError, 0.9 * exactError, 1.1 * exactError);
        // The two splits are unbiased, so the means agree (5 standard errors of their difference).
        Assert.True(Math.Abs(estimate.Model.Mean - estimate.Control.Mean) < 5 * Math.Sqrt((estimate.Model.Variance + estimate.Control.Variance) / n));

        // The LNA's partitioning part is the propagated N/4 (exact here); it exceeds the difference by the propagated parity
        // term, which the LNA's halves rule puts at ⅛ per division: within 0.2 copies² of the exact difference for this λ ≈ 89.
        var lna = LinearNoiseApproximation.SolveBySource(network, options.Grid, new SolverOptions());
        var column = lna.ColumnIndex("P");
        double parity = 0;
        for (var c = 0; c < Divisions; c++) parity = parity / 4 + 0.125;
        Assert.Equal(added, lna.Sources!.Partitioning(last, column) - parity, 0.2);
    }

    [Fact]
    public void WhenCellsDifferTheGroupsOfADrawCarryTheError()
    {
        // k varies from cell to cell (gamma, mean 1, CV 0.1; 8 replicates per draw). Given k the network is the one above with
        // λ(k) = λ(1) + (k − 1)·T·(2 − φ), φ = ½ (the gene makes k per copy, doubled for the second half of the cycle), and both
        // splits keep the mean given k, so Var_binomial − Var_halves = E_k[Var_binomial(k) − Var_halves(k)] (law of total
        // variance, common practice), computed here by the midpoint rule over 200 quantiles of the gamma law.
        var (options, run, estimate) = AtBirth(CellCycleTests.Network(variation: "  varies gamma cv 0.1"), 12_000, 95);
        var last = options.Grid.Count - 1;

        var law = new MathNet.Numerics.Distributions.Gamma(100, 100);
        const int nodes = 200;
        var added = Enumerable.Range(0, nodes).Average(i =>
        {
            var lambda = CellCycleTests.Produced(T, "exponential") + (law.InverseCumulativeDistribution((i + 0.5) / nodes) - 1) * T * 1.5;
            var halves = CellCycleTests.BirthLaw(Divisions, lambda, binomial: false);
            var mean = halves.Select((pr, n) => pr * n).Sum();
            return CellCycleTests.BirthMoments(Divisions, lambda).Variance - halves.Select((pr, n) => pr * (n - mean) * (n - mean)).Sum();
        });
        Assert.True(Math.Abs(estimate.Added - added) < 5 * estimate.AddedStandardError,
            $"added {estimate.Added:G5} ± {estimate.AddedStandardError:G3}, exact {added:G5}");
        // The error comes from the pairs of groups, not from the histogram, whose formula takes the replicates as independent.
        var independent = VarianceEstimate.From(run.Histogram(last, run.CountQuantities.Select(q => q.Name).ToList().IndexOf("P")));
        Assert.True(estimate.Model.StandardError > independent.StandardError, $"{estimate.Model.StandardError:G3} against {independent.StandardError:G3}");
    }

    // The run and its control over 6 cycles, and the estimate for P at the last birth.
    private static (EnsembleOptions Options, EnsembleResult Run, PartitionEstimate Estimate) AtBirth(ReactionNetwork network, long replicates, ulong seed)
    {
        var options = new EnsembleOptions { Grid = new TimeGrid(until: Divisions * T, every: T), Replicates = replicates, Seed = seed, Threads = 2 };
        var run = EnsembleRunner.Run(network, options);
        var control = PartitionControl.Run(network, options, run)!;
        return (options, run, control.At(options.Grid.Count - 1, control.Quantities.Select(q => q.Name).ToList().IndexOf("P")));
    }

    [Fact]
    public void ARunWithoutBinomialPartitioningHasNoControl()
    {
        Assert.Contains("split in halves", PartitionControl.Refusal(CellCycleTests.Network(split: "halves")));
        var plain = ModelLoader.LoadText("species\n  P = 0\nreactions\n  make: 0 -> P  mass 1\n", "plain.cnet").Model!.Network;
        Assert.Contains("no cell cycle", PartitionControl.Refusal(plain));
        Assert.Null(PartitionControl.Refusal(CellCycleTests.Network()));
    }
}
