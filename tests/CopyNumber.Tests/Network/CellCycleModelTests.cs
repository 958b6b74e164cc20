using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.MasterEquation;
using CopyNumber.Network;
using CopyNumber.Sbml;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Network;

/// <summary>
/// The <c>cycle</c> section: how the volume enters the laws, the mean cell of the rate equations, what is
/// refused and what is warned about.
/// </summary>
public sealed class CellCycleModelTests
{
    private const double T = 30, Size = 2;

    private static ReactionNetwork Load(string reactions, string cycle = "length 30\n  genes gene double at 0.25", string extraSpecies = "") => ModelLoader.LoadText($"""
        size {Size}
        species
          gene = 1
          A = 10
          B = 7
          P = 40{extraSpecies}
        parameters
          k = 1.5
          q = 0.5
          kb = 0.02
        reactions
        {reactions}
        cycle
          {cycle}
        """, "cycle.cnet").Model!.Network;

    [Theory]
    [InlineData("exponential")]
    [InlineData("linear")]
    public void MassActionConstantsFollowTheVolume(string growth)
    {
        // c = k·V^(1−m) (docs/network-language.md "Mass action"; Gillespie 1977, J. Phys. Chem. 81:2340, quoted from memory):
        // zeroth order k·V, first order k, second order k/V, with V = Ω·2^(a/T) or Ω·(1 + a/T).
        var network = Load("  import: 0 -> P  mass q\n  convert: A -> P  mass k\n  pair: A + B -> P  mass kb", $"growth {growth}\n  length {T}");
        var counts = network.InitialCounts.ToArray();
        var parameters = network.ParameterValuesWithTime();
        var constants = new double[3];
        network.Propensities.ComputeConstants(parameters, constants);
        foreach (var age in new[] { 0.0, 7.5, 29.0 })
        {
            parameters[network.TimeSlot] = 100 + age;
            parameters[network.Cycle!.BirthSlot] = 100;
            var v = Size * (growth == "exponential" ? Math.Pow(2, age / T) : 1 + age / T);
            Assert.Equal(0.5 * v, network.Propensities.Evaluate(0, counts, constants, parameters), 12);
            Assert.Equal(1.5 * 10, network.Propensities.Evaluate(1, counts, constants, parameters), 12);
            Assert.Equal(0.02 / v * 10 * 7, network.Propensities.Evaluate(2, counts, constants, parameters), 12);
        }
        Assert.True(network.TimeDependence.ReadsTime(0));
        Assert.False(network.TimeDependence.ReadsTime(1)); // a first-order law stays on the fast path
        Assert.True(network.TimeDependence.ReadsTime(2));
    }

    [Fact]
    public void TheRateEquationsFollowTheMeanCellCycleAfterCycle()
    {
        // dP/dt = k·gene + q·V(t), gene doubling at φ = 1/4 and every species halving at k·T: within a cycle that
        // starts at x_c, x(a) = x_c + Λ(a) with Λ(a) = k·a (a < φT), k·φT + 2k(a − φT) after, plus q·Ω·T·(2^(a/T) − 1)/ln 2;
        // at division x_{c+1} = (x_c + Λ(T))/2 (derived here; common practice: a linear ODE between jumps).
        var network = Load("  make: gene -> gene + P  mass k\n  import: 0 -> P  mass q");
        var grid = new TimeGrid(until: 5 * T, every: T / 8);
        var solution = RateEquationSolver.Solve(network, grid, new SolverOptions());
        var p = solution.ColumnIndex("P");
        var gene = solution.ColumnIndex("gene");
        double Produced(double a) => (a < T / 4 ? 1.5 * a : 1.5 * T / 4 + 3.0 * (a - T / 4)) + 0.5 * Size * T * (Math.Pow(2, a / T) - 1) / Math.Log(2);
        var birth = 40.0;
        for (var point = 0; point < grid.Count; point++)
        {
            var cycle = (int)Math.Floor(grid[point] / T + 1e-9);
            var age = grid[point] - cycle * T;
            if (point > 0 && age < 1e-9) birth = (birth + Produced(T)) / 2; // the grid point at a division reads the state after it
            Assert.Equal(birth + Produced(age), solution[point, p], 1e-6 * (birth + Produced(age)));
            Assert.Equal(age < T / 4 ? 1.0 : 2.0, solution[point, gene], 9);
        }
        // The map's closed form: x_c = λ + (x_0 − λ)·2^(−c), λ = Λ(T), the fixed point approached as 2^(−c).
        Assert.Equal(Produced(T) + (40 - Produced(T)) / 32, solution[grid.Count - 1, p], 1e-6 * Produced(T));
    }

    [Theory]
    [InlineData("binomial")]
    [InlineData("halves")]
    public void TheNoiseApproximationJumpsAtDivisionByThePartitioningVariance(string split)
    {
        // Linear production, so the LNA is exact between divisions (common practice: van Kampen 2007, quoted from memory):
        // Var P(a) = σ²_c + Λ(a). At division C ↦ M·C·Mᵀ + Σ with M = ½ and Σ = E[N]/4 for the binomial split
        // (law of total variance), ⅛ for halves (the LNA's rule, P(N odd) taken as ½): σ²_{c+1} = (σ²_c + Λ(T))/4 + Σ.
        var network = Load("  make: gene -> gene + P  mass k\n  import: 0 -> P  mass q", $"length 30\n  genes gene double at 0.25\n  split {split}");
        var grid = new TimeGrid(until: 4 * T, every: T / 6);
        var lna = LinearNoiseApproximation.Solve(network, grid, new SolverOptions());
        var p = lna.ColumnIndex("P");
        double Produced(double a) => (a < T / 4 ? 1.5 * a : 1.5 * T / 4 + 3.0 * (a - T / 4)) + 0.5 * Size * T * (Math.Pow(2, a / T) - 1) / Math.Log(2);
        double mean = 40, variance = 0;
        for (var point = 0; point < grid.Count; point++)
        {
            var cycle = (int)Math.Floor(grid[point] / T + 1e-9);
            var age = grid[point] - cycle * T;
            if (point > 0 && age < 1e-9)
                (mean, variance) = ((mean + Produced(T)) / 2, (variance + Produced(T)) / 4 + (split == "binomial" ? (mean + Produced(T)) / 4 : 0.125));
            Assert.Equal(mean + Produced(age), lna.RateEquationValue(point, p), 1e-6 * (mean + Produced(age)));
            Assert.Equal(variance + Produced(age), lna.Variance(point, p), 1e-5 * (variance + Produced(age)) + 1e-9);
            Assert.Equal(0, lna.Variance(point, lna.ColumnIndex("gene")), 9); // one gene species: its copies are shared exactly
        }
    }

    [Fact]
    public void GenesInTwoStatesAreSharedWithoutReplacement()
    {
        // A promoter that never switches, one copy on and one off, doubled at phase ½ to two and two: the daughter keeps 2
        // of the 4 copies, a uniform subset, so g_on' is hypergeometric with variance n(N − n)/(N − 1)·p(1 − p)
        // = 2·2/3·¼ = 1/3 and Cov(g_on', g_off') = −1/3 (common practice: sampling without replacement).
        var network = ModelLoader.LoadText("""
            species
              g_off = 1
              g_on = 1
              P = 0
            reactions
              make: g_on -> g_on + P  mass 1
            cycle
              length 10
              genes g_off g_on double at 0.5
            """, "genes.cnet").Model!.Network;
        var lna = LinearNoiseApproximation.Solve(network, new TimeGrid(until: 10, every: 5), new SolverOptions());
        Assert.Equal(1.0 / 3, lna.Variance(2, lna.ColumnIndex("g_on")), 9);
        Assert.Equal(1.0 / 3, lna.Variance(2, lna.ColumnIndex("g_off")), 9);
        Assert.Equal(-1.0 / 3, lna.Covariance(2)[0, 1], 9);
        Assert.Equal(0, lna.Variance(1, lna.ColumnIndex("g_on")), 9); // before the division the copies are certain
    }

    [Fact]
    public void AOnePromoterThatSwitchesKeepsTheVarianceOfItsStateAcrossDivisions()
    {
        // One promoter copy switching on and off (first order: the LNA is exact for its mean and covariance between
        // divisions), copied at phase 0.4 and shared at division. With one copy, g_on is 0 or 1, so its variance is
        // m(1 − m) whatever happened before (a Bernoulli law; common practice); with two copies of independent state it is
        // the sum of two such. Evaluated at the mean counts alone, the sharing's variance came out C/4 too large: at a
        // division with two copies of equal mean ½ the LNA said 0.375 where a 0/1 count has at most ¼.
        var network = ModelLoader.LoadText("""
            species
              g_off = 1
              g_on = 0
            parameters
              k_on = 0.02
              k_off = 0.03
            reactions
              activate: g_off -> g_on  mass k_on
              deactivate: g_on -> g_off  mass k_off
            cycle
              length 10
              genes g_off g_on double at 0.4
            """, "promoter.cnet").Model!.Network;
        var grid = new TimeGrid(until: 40, every: 1);
        var lna = LinearNoiseApproximation.Solve(network, grid, new SolverOptions(RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-12));
        var on = lna.ColumnIndex("g_on");
        for (var point = 0; point < grid.Count; point++)
        {
            var phase = grid[point] / 10 - Math.Floor(grid[point] / 10 + 1e-9);
            if (phase >= 0.4 - 1e-9) continue; // two copies: checked below through the daughters
            var m = lna.RateEquationValue(point, on);
            Assert.Equal(m * (1 - m), lna.Variance(point, on), 8);
            Assert.Equal(-m * (1 - m), lna.Covariance(point)[0, 1], 8);
        }
        Assert.True(lna.RateEquationValue(10, on) > 0.1, "the promoter must have switched on by the first division, or the check is empty");
    }

    [Fact]
    public void MethodsThatCannotCarryACycleRefuseItAtItsLine()
    {
        var network = Load("  make: gene -> gene + P  mass k\n  import: 0 -> P  mass q");
        var refusals = new List<string>
        {
            Assert.Throws<UnsupportedModelException>(() => FiniteStateProjection.Solve(network, new TimeGrid(until: 1, every: 1), new ExactOptions())).Message,
            Assert.Throws<UnsupportedModelException>(() => SimulatorFactory.Create(SimulationMethod.TauLeap, network, new SimulatorOptions())).Message,
            Assert.Throws<UnsupportedModelException>(() => SimulatorFactory.Create(SimulationMethod.NextReaction, network, new SimulatorOptions())).Message,
        };
        var loaded = ModelLoader.LoadText(string.Join("\n", "species", "  P = 0", "reactions", "  import: 0 -> P  mass 1", "cycle", "  length 30"), "export.cnet").Model!;
        var export = SbmlExporter.Export(loaded);
        Assert.Null(export.Xml);
        refusals.Add(export.Diagnostics.Single().Format());
        Assert.All(refusals, m => Assert.Contains("declares a cell cycle", m));
        Assert.Contains("export.cnet:5:1:", refusals[^1]);
        // Without a propensity that reads the volume, the next reaction method carries the divisions out.
        var firstOrder = Load("  make: gene -> gene + P  mass k\n  decay: P -> 0  mass q");
        Assert.NotNull(SimulatorFactory.Create(SimulationMethod.NextReaction, firstOrder, new SimulatorOptions()));
    }

    [Fact]
    public void ARateLawInCountsThatIgnoresTheVolumeIsWarnedAbout()
    {
        var network = Load("  basal: 0 -> P  rate k\n  mm: A -> P  rate k * A / (1 + A)\n  linear: A -> P  rate k * A\n  sized: 0 -> P  rate k * size", "length 30");
        var warned = network.Cycle!.Warnings.Select(w => w.Message).ToArray();
        Assert.Equal(2, warned.Length);
        Assert.Contains("reaction 'basal'", warned[0]);
        Assert.Contains("reaction 'mm'", warned[1]);
        Assert.True(network.TimeDependence.ReadsTime(3)); // 'size' in a rate law is V(t)
    }

    [Theory]
    [InlineData("length 30\n  growth cubic", "'exponential' or 'linear' after 'growth'")]
    [InlineData("length 30 gamma 0.2", "expected 'cv'")]
    [InlineData("growth linear", "the cycle needs its length")]
    [InlineData("length 0", "the cycle length must be a positive finite number")]
    [InlineData("length 30\n  genes gene double at 1", "0 or more and below 1")]
    [InlineData("length 30\n  genes gen double at 0.5", "unknown species 'gen'")]
    [InlineData("length 30\n  genes gene at 0.5", "'double at <phase>'")]
    [InlineData("length 30\n  split thirds", "'binomial' or 'halves' after 'split'")]
    [InlineData("length 30\n  length 20", "the cycle's 'length' is set twice")]
    [InlineData("length 30\n  divide now", "a cycle setting")]
    public void MistakesInTheCycleAreReported(string cycle, string message)
    {
        var outcome = ModelLoader.LoadText($"species\n  gene = 1\n  P = 0\nreactions\n  make: gene -> gene + P  mass 1\ncycle\n  {cycle}\n", "bad.cnet");
        Assert.Null(outcome.Model);
        Assert.Contains(outcome.Diagnostics, d => d.Format().Contains(message));
    }
}
