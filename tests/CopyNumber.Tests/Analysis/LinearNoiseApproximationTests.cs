using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Network;
using MathNet.Numerics.LinearAlgebra;
using static CopyNumber.Tests.Analysis.AnalysisModels;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// For networks whose propensities are constant or linear in the counts, the moment equations close and
/// the linear noise approximation is exact (van Kampen 2007, Stochastic Processes in Physics and
/// Chemistry, 3rd ed., ch. X; common practice). So the LNA must reproduce exact variances known in closed
/// form or solved here independently of the project's code.
/// </summary>
public sealed class LinearNoiseApproximationTests
{
    private const string ImmigrationDeath = """
        species
          A = 0
        parameters
          alpha = 12
          mu = 0.3
        reactions
          birth: 0 -> A mass alpha
          death: A -> 0 mass mu
        readouts
          twice = 2*A
        """;

    [Fact]
    public void ImmigrationDeathFromZeroIsPoissonAtEveryTime()
    {
        // Immigration–death from x(0) = 0: x(t) ~ Poisson((α/μ)(1 − e^(−μt))), so variance = mean
        // (Bailey 1964, The Elements of Stochastic Processes, ch. 7 and 8; quoted from memory).
        var network = Compile(ImmigrationDeath);
        var grid = new TimeGrid(20, 0.5);
        var lna = LinearNoiseApproximation.Solve(network, grid, Tight);
        var a = network.SpeciesIndex("A");
        var twice = lna.ColumnIndex("twice");
        Assert.False(lna.HasMeanCorrection);
        for (var k = 0; k < grid.Count; k++)
        {
            var exact = 12 / 0.3 * (1 - Math.Exp(-0.3 * grid[k]));
            Assert.Equal(exact, lna.RateEquationValue(k, a), 1e-7 * Math.Max(exact, 1));
            Assert.Equal(exact, lna.Variance(k, a), 1e-7 * Math.Max(exact, 1));
            // Var(2A) = 4·Var(A) for the linear readout.
            Assert.Equal(4 * exact, lna.Variance(k, twice), 4e-7 * Math.Max(exact, 1));
            Assert.True(double.IsNaN(lna.CorrectedMean(k, a)));
        }
    }

    [Fact]
    public void ImmigrationDeathFromAFixedCountAddsBinomialSurvivors()
    {
        // From x(0) = n0 the survivors are Binomial(n0, e^(−μt)) and the immigrants Poisson((α/μ)(1 − e^(−μt))),
        // independent, so Var = n0·p(1 − p) + (α/μ)(1 − p) with p = e^(−μt) (Bailey 1964, ch. 8; quoted from memory).
        var network = Compile(ImmigrationDeath.Replace("A = 0", "A = 100"));
        var grid = new TimeGrid(15, 0.25);
        var lna = LinearNoiseApproximation.Solve(network, grid, Tight);
        for (var k = 0; k < grid.Count; k++)
        {
            var p = Math.Exp(-0.3 * grid[k]);
            var exact = 100 * p * (1 - p) + 40 * (1 - p);
            Assert.Equal(exact, lna.Variance(k, 0), 1e-7 * Math.Max(exact, 1));
        }
    }

    [Fact]
    public void AddingACountIsADeterministicJumpAndSettingOneRestartsTheNoise()
    {
        // At t = 5 ten molecules are added (every replicate gains exactly 10): afterwards the earlier
        // Poisson(m5) population thins to Poisson(m5·q), the ten added ones survive as Binomial(10, q),
        // and new immigrants are Poisson(40(1 − q)), q = e^(−μ(t − 5)). At t = 12 the count is set to 0 in
        // every replicate, so the process restarts from a deterministic 0 (Bailey 1964, ch. 8; Poisson
        // thinning, common practice).
        var network = Compile(ImmigrationDeath.Replace("readouts", "changes\n  A += 10  at time 5\n  A = 0  at time 12\nreadouts"));
        var grid = new TimeGrid(20, 0.5);
        var lna = LinearNoiseApproximation.Solve(network, grid, Tight);
        var m5 = 40 * (1 - Math.Exp(-0.3 * 5));
        for (var k = 0; k < grid.Count; k++)
        {
            var t = grid[k];
            double mean, variance;
            if (t < 5) { mean = variance = 40 * (1 - Math.Exp(-0.3 * t)); }
            else if (t < 12)
            {
                var q = Math.Exp(-0.3 * (t - 5));
                mean = m5 * q + 10 * q + 40 * (1 - q);
                variance = m5 * q + 10 * q * (1 - q) + 40 * (1 - q);
            }
            else { mean = variance = 40 * (1 - Math.Exp(-0.3 * (t - 12))); }
            Assert.Equal(mean, lna.RateEquationValue(k, 0), 1e-7 * Math.Max(mean, 1));
            Assert.Equal(variance, lna.Variance(k, 0), 1e-7 * Math.Max(variance, 1));
        }
    }

    [Fact]
    public void IsomerisationIsBinomialAndKeepsTheConservedTotalExact()
    {
        // A <-> B from n molecules of A: each molecule is independently in B with probability
        // p(t) = k1/(k1 + k2)·(1 − e^(−(k1 + k2)t)), so B ~ Binomial(n, p), Cov(A, B) = −Var(B) and
        // A + B = n has variance 0 (monomolecular networks: Jahnke & Huisinga 2007, J. Math. Biol. 54:1).
        var network = Compile("""
            species
              A = 50
              B = 0
            reactions
              flip: A -> B mass 0.4  back mass 0.1
            readouts
              total = A + B
            """);
        var grid = new TimeGrid(20, 0.5);
        var lna = LinearNoiseApproximation.Solve(network, grid, Tight);
        var total = lna.ColumnIndex("total");
        for (var k = 0; k < grid.Count; k++)
        {
            var p = 0.4 / 0.5 * (1 - Math.Exp(-0.5 * grid[k]));
            var exact = 50 * p * (1 - p);
            var c = lna.Covariance(k);
            Assert.Equal(exact, c[1, 1], 1e-7 * Math.Max(exact, 1));
            Assert.Equal(exact, c[0, 0], 1e-7 * Math.Max(exact, 1));
            Assert.Equal(-exact, c[0, 1], 1e-7 * Math.Max(exact, 1));
            Assert.Equal(0.0, lna.Variance(k, total), 1e-6);
            Assert.Equal(50.0, lna.RateEquationValue(k, total), 1e-8);
        }
    }

    [Fact]
    public void TwoStageGeneExpressionHasTheStationaryProteinFanoFactorOfThattaiAndVanOudenaarden()
    {
        // mRNA made at k_R and degraded at γ_R, protein made at k_P per mRNA and degraded at γ_P.
        // Stationary moments (Thattai & van Oudenaarden 2001, PNAS 98:8614; quoted from memory and
        // checked below against the moment equations solved here): ⟨p⟩ = k_R·k_P/(γ_R·γ_P),
        // Fano(p) = 1 + b/(1 + η) with burst size b = k_P/γ_R and η = γ_P/γ_R, i.e. 1 + k_P/(γ_R + γ_P).
        const double kR = 0.5, gR = 0.25, kP = 2.0, gP = 0.05;
        var network = Compile($"""
            species
              M = 0
              P = 0
            reactions
              transcription: 0 -> M mass {kR}
              mrna_decay: M -> 0 mass {gR}
              translation: M -> M + P mass {kP}
              protein_decay: P -> 0 mass {gP}
            """);
        var grid = new TimeGrid(600, 50); // 30 protein lifetimes: e^(−30) is far below the tolerances
        var lna = LinearNoiseApproximation.Solve(network, grid, Tight);
        var last = grid.Count - 1;
        var meanP = kR * kP / (gR * gP);
        var fano = 1 + (kP / gR) / (1 + gP / gR);
        Assert.Equal(meanP, lna.RateEquationValue(last, 1), 1e-6 * meanP);
        Assert.Equal(fano, lna.Variance(last, 1) / lna.RateEquationValue(last, 1), 1e-6);
        Assert.Equal(kR / gR, lna.Variance(last, 0), 1e-6); // mRNA is Poisson

        // The same stationary covariance from the moment equations A·Σ + Σ·Aᵀ + D = 0 (exact for a linear
        // network; common practice), solved as a Kronecker-product linear system with MathNet.
        var drift = Matrix<double>.Build.DenseOfArray(new[,] { { -gR, 0 }, { kP, -gP } });
        var m = kR / gR;
        var p = meanP;
        var diffusion = Matrix<double>.Build.DenseOfArray(new[,] { { kR + gR * m, 0 }, { 0, kP * m + gP * p } });
        var identity = Matrix<double>.Build.DenseIdentity(2);
        var sigma = (identity.KroneckerProduct(drift) + drift.KroneckerProduct(identity))
            .Solve(-Vector<double>.Build.DenseOfArray(diffusion.ToColumnMajorArray()));
        var c = lna.Covariance(last);
        Assert.Equal(sigma[0], c[0, 0], 1e-6 * sigma[0]);
        Assert.Equal(sigma[1], c[1, 0], 1e-6 * sigma[1]);
        Assert.Equal(sigma[3], c[1, 1], 1e-6 * sigma[3]);
        Assert.Equal(fano, sigma[3] / p, 1e-9); // the quoted formula agrees with the moment equations
    }

    [Fact]
    public void StiffAndExplicitSolversGiveTheSameCovariance()
    {
        // The augmented system's Jacobian feeds the stiff solver; its answer must match the closed form
        // of the immigration–death test above (Bailey 1964), as the explicit solver's does.
        var network = Compile(ImmigrationDeath.Replace("A = 0", "A = 100"));
        var grid = new TimeGrid(10, 1);
        var stiff = LinearNoiseApproximation.Solve(network, grid, Tight with { Kind = SolverKind.Stiff });
        var explicitOnly = LinearNoiseApproximation.Solve(network, grid, Tight with { Kind = SolverKind.Explicit });
        for (var k = 0; k < grid.Count; k++)
        {
            var p = Math.Exp(-0.3 * grid[k]);
            var exact = 100 * p * (1 - p) + 40 * (1 - p);
            Assert.Equal(exact, stiff.Variance(k, 0), 1e-6 * Math.Max(exact, 1));
            Assert.Equal(exact, explicitOnly.Variance(k, 0), 1e-6 * Math.Max(exact, 1));
        }
        Assert.True(stiff.Statistics.StiffSteps > 0);
    }
}
