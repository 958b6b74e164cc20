using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Tests.Stochastic;
using MathNet.Numerics.Distributions;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Ensembles;

/// <summary>
/// The population snapshot against (1) closed forms for a fixed cycle length, computed here by quadrature of the
/// age mixture of the lineage's laws, and (2) a population simulated cell by cell in the test, every cell of a
/// growing tree followed, for a fixed and a gamma cycle length; the latter shares nothing with the engine's
/// weighting (it has no weights, no ancestral law and its own random numbers).
/// </summary>
public sealed class PopulationSnapshotTests(ITestOutputHelper log)
{
    private const double T = CellCycleTests.T, Phase = CellCycleTests.Phase;

    /// <summary>
    /// The stable protein of <see cref="CellCycleTests"/> (a gene doubling at φ = ½ and production q·V(t)), fixed T.
    /// Within cycle c (born after c divisions from P = 50) P(a) = B_c + Poisson(Λ(a)), B_c with the birth moments of
    /// the map μ' = (μ + λ)/2, σ²' = (σ² + λ)/4 + (μ + λ)/4 and the exact birth law (derived in CellCycleTests;
    /// Huh &amp; Paulsson 2011, Nat. Genet. 43:95). The lineage's records have uniform ages; the snapshot's ages
    /// have the density g(a) = 2 ln 2/T·2^(−a/T) of an exponentially growing culture with a fixed cycle length
    /// (Powell 1956, J. Gen. Microbiol. 15:492; for a fixed length a cell's law given its age is the same in the
    /// lineage and in the culture). The expected values of the estimators are the mixtures over the sampled cycles
    /// and over ages under either density, computed here by Simpson's rule split at the kink φT.
    /// </summary>
    [Fact]
    public void AFixedLengthGivesTheAgeMixtureOfTheLineagesLaws()
    {
        const int burnIn = 6, cycles = 8;
        var network = CellCycleTests.Network();
        var result = PopulationSnapshot.Run(network, new SnapshotOptions(1_000, 2017, burnIn, cycles, Threads: 2));
        var p = network.SpeciesIndex("P");
        var (lineage, population) = result.Species[p];
        var lambda = CellCycleTests.Produced(T, "exponential");
        double Uniform(double a) => 1 / T;
        double Culture(double a) => 2 * Math.Log(2) / T * Math.Pow(2, -a / T);

        foreach (var (law, density, name) in new[] { (lineage, (Func<double, double>)Uniform, "lineage"), (population, Culture, "population") })
        {
            // Moments: E[x | a, c] = μ_c + Λ(a), E[x² | a, c] = σ²_c + Λ(a) + (μ_c + Λ(a))², averaged over the sampled cycles and ages.
            double mean = 0, second = 0;
            for (var c = burnIn; c < burnIn + cycles; c++)
            {
                var (mu, s2) = CellCycleTests.BirthMoments(c, lambda);
                mean += AgeAverage(density, a => mu + Lambda(a)) / cycles;
                second += AgeAverage(density, a => s2 + Lambda(a) + Math.Pow(mu + Lambda(a), 2)) / cycles;
            }
            var variance = second - mean * mean;
            log.WriteLine($"{name}: mean {law.Mean} (exact {mean:G6}), variance {law.Variance} (exact {variance:G6}), CV² {law.Cv2}, Fano {law.Fano}");
            Within(law.Mean, mean, $"{name} mean");
            Within(law.Variance, variance, $"{name} variance");
            Within(law.Cv2, variance / (mean * mean), $"{name} CV²");
            Within(law.Fano, variance / mean, $"{name} Fano");

            // The law: the mixture over cycles and ages of the birth law convolved with Poisson(Λ(a)).
            var exact = new double[700];
            for (var c = burnIn; c < burnIn + cycles; c++)
            {
                var birth = CellCycleTests.BirthLaw(c, lambda, binomial: true);
                var last = Array.FindLastIndex(birth, q => q > 1e-300);
                foreach (var (a, w) in Nodes(density))
                {
                    var produced = Lambda(a);
                    for (var b = 0; b <= last; b++)
                    {
                        if (birth[b] < 1e-16) continue;
                        for (var n = 0; n + b < exact.Length && n < produced + 12 * Math.Sqrt(produced) + 30; n++)
                            exact[b + n] += w / cycles * birth[b] * (produced > 0 ? Poisson.PMF(produced, n) : n == 0 ? 1 : 0);
                    }
                }
            }
            var checkedCounts = 0;
            var tested = Enumerable.Range(0, law.Counts.Length).Where(i => exact[law.Counts[i]] > 2e-3).ToArray();
            // Bonferroni over the counts tested, family-wise 10⁻³ (common practice).
            var z = Normal.InvCDF(0, 1, 1 - 1e-3 / (2 * tested.Length));
            foreach (var i in tested)
            {
                Assert.True(Math.Abs(law.Probabilities[i] - exact[law.Counts[i]]) <= z * law.ProbabilityErrors[i],
                    $"{name}: P({law.Counts[i]}) = {law.Probabilities[i]:G5} ± {law.ProbabilityErrors[i]:G3}, exact {exact[law.Counts[i]]:G5}");
                checkedCounts++;
            }
            Assert.True(checkedCounts > 30, $"{name}: {checkedCounts} counts tested");
        }

        // The stationary values quoted in docs/methods.md (ours, by the same quadrature): mean 126.6 against 121.6, variance 794 against 742.
        var (stationaryLineage, stationaryCulture) = (Stationary(Uniform, lambda), Stationary(Culture, lambda));
        Assert.Equal(126.6, stationaryLineage.Mean, 0.05);
        Assert.Equal(121.6, stationaryCulture.Mean, 0.05);
        Assert.Equal(794, stationaryLineage.Variance, 0.5);
        Assert.Equal(742, stationaryCulture.Variance, 0.5);
        log.WriteLine($"population − lineage: mean {result.MeanDifference[p]}, variance {result.VarianceDifference[p]}");
        // The difference is resolved: the snapshot's mean is lower than the lineage's by many standard errors.
        Assert.True(result.MeanDifference[p].Value < -10 * result.MeanDifference[p].StandardError,
            $"population − lineage = {result.MeanDifference[p].Value:G4} ± {result.MeanDifference[p].StandardError:G3}");
    }

    /// <summary>
    /// Λ solves the Euler–Lotka equation 2∫e^(−Λτ) f(τ) dτ = 1 (Powell 1956) and the ancestral law 2e^(−Λτ) f(τ) has
    /// mean T·2^(−c²), both checked by numerical quadrature over the gamma density (MathNet), not by the closed form.
    /// </summary>
    [Theory]
    [InlineData(0.1)]
    [InlineData(0.3)]
    [InlineData(0.7)]
    public void TheGrowthRateSolvesEulerLotka(double cv)
    {
        var cycle = ModelLoader.LoadText($"""
            species
              P = 0
            reactions
              make: 0 -> P  mass 1
            cycle
              length {T} gamma cv {cv}
            """, "el.cnet").Model!.Network.Cycle!;
        var growth = BalancedGrowth.GrowthRate(cycle);
        var f = new Gamma(1 / (cv * cv), 1 / (T * cv * cv));
        var lotka = MathNet.Numerics.Integrate.OnClosedInterval(t => 2 * Math.Exp(f.DensityLn(t) - growth * t), 1e-9, 20 * T, 1e-12);
        Assert.Equal(1.0, lotka, 1e-8);
        var ancestralMean = MathNet.Numerics.Integrate.OnClosedInterval(t => t * 2 * Math.Exp(f.DensityLn(t) - growth * t), 1e-9, 20 * T, 1e-12);
        Assert.Equal(ancestralMean, T * BalancedGrowth.AncestralScale(cycle), 1e-6 * T);
    }

    /// <summary>
    /// A culture simulated cell by cell: a protein made at rate q·V(t) (V = 2^(a/τ) in a cycle of length τ), never
    /// degraded, split binomially at division, both daughters followed. Between divisions the count is the birth
    /// count plus Poisson(Λ_τ(a)), Λ_τ(a) = q·τ·(2^(a/τ) − 1)/ln 2 (common practice: a Poisson process of known
    /// integrated rate), so the tree needs no event simulation. Each culture starts from 16 cells of random age
    /// (asynchronous: age density ∝ 2^(−a/τ), the fixed-length culture's) with P at birth drawn from Poisson(λ_τ), λ_τ = Λ_τ(τ),
    /// and is read at 7 mean cycles (some 2 000 cells). The pooled law of 300 cultures, with standard errors from
    /// the spread between cultures, must match the snapshot mode within 5 combined standard errors — and must not
    /// match the lineage's time average, which differs by more.
    /// </summary>
    [Theory]
    [InlineData(0.0)]
    [InlineData(0.3)]
    public void ACultureFollowedCellByCellAgreesWithTheSnapshot(double cv)
    {
        const double q = 1.0, length = 20;
        var lengthText = cv == 0 ? $"{length}" : $"{length} gamma cv {cv}";
        var network = ModelLoader.LoadText($"""
            # a protein made in proportion to the volume of a growing, dividing cell; illustrative
            species
              P = 30
            reactions
              make: 0 -> P  mass {q}
            cycle
              length {lengthText}
            """, "culture.cnet").Model!.Network;
        var snapshot = PopulationSnapshot.Run(network, new SnapshotOptions(1_200, 31, BurnIn: 6, Cycles: 10, Threads: 2));
        var (lineage, population) = snapshot.Species[0];

        var random = new Random(cv == 0 ? 1956 : 2002);
        double Draw() => cv == 0 ? length : Gamma.Sample(random, 1 / (cv * cv), 1 / (length * cv * cv));
        double Made(double age, double tau) => q * tau * (Math.Pow(2, age / tau) - 1) / Math.Log(2);
        const int cultures = 300;
        var (n, s1, s2) = (new double[cultures], new double[cultures], new double[cultures]);
        for (var k = 0; k < cultures; k++)
        {
            var observe = 7 * length;
            // Cells waiting to divide, by division time: (birth count, birth time, length).
            var queue = new PriorityQueue<(long Born, double Birth, double Tau), double>();
            for (var i = 0; i < 16; i++)
            {
                var tau = Draw();
                var age = -tau * Math.Log2(1 - random.NextDouble() / 2);
                // Born with Poisson(λ_τ), the birth law of the fixed-length lineage at its fixed point: at age a it holds Poisson(λ_τ + Λ_τ(a)).
                queue.Enqueue((Poisson.Sample(random, Made(tau, tau)), -age, tau), tau - age);
            }
            while (queue.TryPeek(out _, out var at) && at <= observe)
            {
                var cell = queue.Dequeue();
                var before = cell.Born + Poisson.Sample(random, Made(cell.Tau, cell.Tau));
                var kept = Binomial.Sample(random, 0.5, (int)before);
                foreach (var daughter in new long[] { kept, before - kept })
                {
                    var tau = Draw();
                    queue.Enqueue((daughter, at, tau), at + tau);
                }
            }
            foreach (var (cell, _) in queue.UnorderedItems)
            {
                var x = (double)(cell.Born + Poisson.Sample(random, Made(observe - cell.Birth, cell.Tau)));
                (n[k], s1[k], s2[k]) = (n[k] + 1, s1[k] + x, s2[k] + x * x);
            }
        }
        // The pooled law of all cells, and its standard errors from the cultures' residuals (ratio estimator; Cochran 1977, §6.4).
        var (cells, mean) = (n.Sum(), s1.Sum() / n.Sum());
        var second = s2.Sum() / cells;
        var variance = second - mean * mean;
        var perCulture = cells / cultures;
        var meanError = Math.Sqrt(Enumerable.Range(0, cultures).Sum(k => Math.Pow((s1[k] - mean * n[k]) / perCulture, 2)) / (cultures * (cultures - 1.0)));
        var varianceError = Math.Sqrt(Enumerable.Range(0, cultures).Sum(k =>
            Math.Pow((s2[k] - second * n[k]) / perCulture - 2 * mean * (s1[k] - mean * n[k]) / perCulture, 2)) / (cultures * (cultures - 1.0)));

        log.WriteLine($"culture: mean {mean:G6} ± {meanError:G3}, variance {variance:G6} ± {varianceError:G3}, {cells / cultures:G4} cells per culture; " +
            $"snapshot {population.Mean} {population.Variance}; lineage {lineage.Mean} {lineage.Variance}");
        Assert.True(Math.Abs(population.Mean.Value - mean) <= 5 * Math.Sqrt(meanError * meanError + Math.Pow(population.Mean.StandardError, 2)),
            $"snapshot mean {population.Mean.Value:G5} ± {population.Mean.StandardError:G3}, culture {mean:G5} ± {meanError:G3} ({cells / cultures:G4} cells per culture)");
        Assert.True(Math.Abs(population.Variance.Value - variance) <= 5 * Math.Sqrt(varianceError * varianceError + Math.Pow(population.Variance.StandardError, 2)),
            $"snapshot variance {population.Variance.Value:G5} ± {population.Variance.StandardError:G3}, culture {variance:G5} ± {varianceError:G3}");
        // The check can fail: the lineage's average is far from the culture.
        Assert.True(Math.Abs(lineage.Mean.Value - mean) > 5 * Math.Sqrt(meanError * meanError + Math.Pow(lineage.Mean.StandardError, 2)),
            $"lineage mean {lineage.Mean.Value:G5} ± {lineage.Mean.StandardError:G3} should differ from the culture's {mean:G5} ± {meanError:G3}");
    }

    /// <summary>
    /// A gene copied at phase φ of a gamma-distributed cycle (CV 0.25) has one copy before φτ and two after, whatever
    /// else happens, so its law in each view is exact. Along the mother machine's lineage, weighted by time: one copy
    /// for the fraction φ of the time (renewal-reward, common practice). In the culture, with the snapshot's age and
    /// length density Λ·2e^(−Λa) f(τ) 1{a &lt; τ} (Powell 1956): P(one copy) = E_f[2(1 − e^(−Λφτ))] = 2 − 2(1 + Λθφ)^(−k)
    /// for the gamma law of shape k and scale θ (derived here), with Λ found here by bisection on the Euler–Lotka
    /// equation integrated numerically, not from the engine.
    /// </summary>
    [Fact]
    public void AGenesCopiesInACultureFollowTheSnapshotsAgeAndLengthLaw()
    {
        const double cv = 0.25, length = 30, phase = 0.3;
        var network = ModelLoader.LoadText($"""
            species
              gene = 1
              P = 0
            reactions
              make: gene -> gene + P  mass 0.1
              decay: P -> 0  mass 0.1
            cycle
              length {length} gamma cv {cv}
              genes gene double at {phase}
            """, "gene.cnet").Model!.Network;
        var result = PopulationSnapshot.Run(network, new SnapshotOptions(3000, 78, BurnIn: 1, Cycles: 6, Threads: 2));
        var (lineage, population) = result.Species[network.SpeciesIndex("gene")];
        var (k, theta) = (1 / (cv * cv), length * cv * cv);
        var f = new Gamma(k, 1 / theta);
        double Lotka(double rate) => MathNet.Numerics.Integrate.OnClosedInterval(t => 2 * Math.Exp(f.DensityLn(t) - rate * t), 1e-9, 20 * length, 1e-12) - 1;
        double low = 0, high = 1 / theta;
        for (var i = 0; i < 100; i++) (low, high) = Lotka((low + high) / 2) > 0 ? ((low + high) / 2, high) : (low, (low + high) / 2);
        var growth = (low + high) / 2;
        var oneCopy = 2 - 2 * Math.Pow(1 + growth * theta * phase, -k);
        foreach (var (law, single, name) in new[] { (lineage, phase, "lineage"), (population, oneCopy, "population") })
        {
            log.WriteLine($"{name}: P(one copy) {law.Probabilities[0]:G6} ± {law.ProbabilityErrors[0]:G3}, exact {single:G6}; mean {law.Mean}");
            Assert.Equal([1L, 2L], law.Counts);
            Assert.True(Math.Abs(law.Probabilities[0] - single) <= Math.Max(5 * law.ProbabilityErrors[0], 1e-12), $"{name}: P(one copy) {law.Probabilities[0]} ± {law.ProbabilityErrors[0]}, exact {single}");
            Assert.True(Math.Abs(law.Mean.Value - (2 - single)) <= Math.Max(5 * law.Mean.StandardError, 1e-12), $"{name}: mean {law.Mean}, exact {2 - single}");
        }
    }

    /// <summary>
    /// The settling check: the stable protein starts at P = 50 while its birth mean is λ = 88.85 at the fixed point,
    /// and the birth mean's distance to λ halves at each division (the map μ' = (μ + λ)/2, derived in
    /// CellCycleTests). With no burn-in, the first half of 8 sampled cycles lies some 18 copies below the second on
    /// average (38.85·(1 + ½ + ¼ + ⅛)/4 − 38.85·2^(−4)·(1 + ½ + ¼ + ⅛)/4): flagged. After 14 divisions the distance
    /// is 0.002 copies, far below the standard error: not flagged.
    /// </summary>
    [Fact]
    public void TheSettlingCheckFlagsAShortBurnInOnly()
    {
        var network = CellCycleTests.Network();
        var p = network.SpeciesIndex("P");
        var early = PopulationSnapshot.Run(network, new SnapshotOptions(300, 5, BurnIn: 0, Cycles: 8, Threads: 2));
        log.WriteLine($"burn-in 0: later − earlier half {early.Settling[p]}");
        Assert.Contains(early.Unsettled(), u => u.Species == "P");
        Assert.InRange(early.Settling[p].Value, 10, 30);
        var settled = PopulationSnapshot.Run(network, new SnapshotOptions(300, 5, BurnIn: 14, Cycles: 4, Threads: 2));
        log.WriteLine($"burn-in 14: later − earlier half {settled.Settling[p]}");
        Assert.DoesNotContain(settled.Unsettled(), u => u.Species == "P");
    }

    private static double Lambda(double a) => CellCycleTests.Produced(a, "exponential");

    private static (double Mean, double Variance) Stationary(Func<double, double> density, double lambda)
    {
        // At the fixed point the birth law is Poisson(λ), so P(a) ~ Poisson(λ + Λ(a)): a Poisson mixture.
        var mean = AgeAverage(density, a => lambda + Lambda(a));
        var second = AgeAverage(density, a => lambda + Lambda(a) + Math.Pow(lambda + Lambda(a), 2));
        return (mean, second - mean * mean);
    }

    // Composite Simpson nodes and weights (times the density) on [0, φT] and [φT, T], where Λ has its kink.
    private static IEnumerable<(double Age, double Weight)> Nodes(Func<double, double> density, int intervals = 64)
    {
        foreach (var (from, to) in new[] { (0.0, Phase * T), (Phase * T, T) })
        {
            var h = (to - from) / intervals;
            for (var i = 0; i <= intervals; i++)
            {
                var a = from + i * h;
                var simpson = i == 0 || i == intervals ? 1 : i % 2 == 1 ? 4 : 2;
                yield return (a, simpson * h / 3 * density(a));
            }
        }
    }

    private static double AgeAverage(Func<double, double> density, Func<double, double> value) =>
        Nodes(density, 512).Sum(node => node.Weight * value(node.Age));

    private static void Within(Estimate estimate, double exact, string what) =>
        Assert.True(Math.Abs(estimate.Value - exact) <= 5 * estimate.StandardError,
            $"{what}: {estimate.Value:G6} ± {estimate.StandardError:G3}, exact {exact:G6}");
}
