using CopyNumber.Ensembles;
using CopyNumber.MasterEquation;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Stochastic;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// Ensembles of every exact simulation method against the exact law of the master equation, computed
/// independently of the simulators by finite state projection (ε = 10⁻⁹). Pearson's χ² goodness of fit
/// (Pearson 1900, Philos. Mag. 50:157) per species and grid time, with adjacent counts pooled until every
/// cell expects at least 5 replicates (Cochran 1954, Biometrics 10:417; common practice), df = cells − 1.
/// Family-wise level 10⁻³ per method and model: each of its m tests (grid times × species) runs at 10⁻³/m
/// (Bonferroni). Seeds are fixed, so the outcome is reproducible; the level says how unlikely a correct
/// simulator is to have failed with some seed.
/// </summary>
public sealed class EnsembleAgainstExactLawTests
{
    private const double FamilyWiseLevel = 1e-3;
    private const long Replicates = 4000;

    public static readonly TheoryData<SimulationMethod, string> Cases = Build();

    private static TheoryData<SimulationMethod, string> Build()
    {
        var data = new TheoryData<SimulationMethod, string>();
        foreach (var method in new[] { SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.CompositionRejection })
            foreach (var model in new[] { "telegraph", "dimerisation" }) data.Add(method, model);
        return data;
    }

    private static ReactionNetwork Model(string name) => name switch
    {
        // A promoter switching on and off with transcription and decay of its mRNA (first-order reactions).
        "telegraph" => ExactModels.Telegraph(kOn: 0.5, kOff: 1, kTx: 10, decay: 1),
        // Reversible dimerisation 2A ⇄ B from A = 30: a bimolecular, nonlinear rate law.
        _ => ExactModels.Load("species\n  A = 30\n  B = 0\nreactions\n  dimerise: 2 A -> B mass 0.02\n  split: B -> 2 A mass 0.5\n"),
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void TheEnsembleIsASampleOfTheExactLaw(SimulationMethod method, string model)
    {
        var network = Model(model);
        var grid = new TimeGrid(until: 4, every: 1);
        var exact = FiniteStateProjection.Solve(network, grid, new ExactOptions(1e-9));
        var ensemble = EnsembleRunner.Run(network, new EnsembleOptions { Grid = grid, Replicates = Replicates, Seed = 2024, Threads = 2, Method = method });
        var tests = new List<(int Time, int Quantity, int Exact)>();
        for (var q = 0; q < ensemble.CountQuantities.Count; q++)
        {
            var e = exact.Quantities.ToList().FindIndex(x => x.Name == ensemble.CountQuantities[q].Name);
            for (var k = 1; k < grid.Count; k++) tests.Add((k, q, e));
        }
        foreach (var (k, q, e) in tests)
        {
            var law = exact.Law(k, e).Distribution!;
            var observed = ensemble.Histogram(k, q).ToDictionary(f => f.Value, f => (double)f.Frequency);
            var (statistic, cells) = PooledChiSquare(law, observed, Replicates);
            if (cells < 2) continue; // a law concentrated on one count has nothing to test
            var critical = ChiSquared.InvCDF(cells - 1, 1 - FamilyWiseLevel / tests.Count);
            Assert.True(statistic <= critical,
                $"{method}, {model}, {ensemble.CountQuantities[q].Name} at t = {grid[k]}: χ² = {statistic:F1} on {cells - 1} df above {critical:F1}");
        }
    }

    /// <summary>
    /// Pearson's χ² after pooling: counts in increasing order are merged into a cell until it expects ≥ 5
    /// replicates; a short last cell joins the one before; replicates outside the law's support fall in the end cells.
    /// </summary>
    private static (double Statistic, int Cells) PooledChiSquare(CopyNumber.Analysis.CountDistribution law, Dictionary<long, double> observed, long n)
    {
        var cells = new List<(double Expected, double Observed)>();
        double expected = 0, seen = observed.Where(o => o.Key < law.Values[0]).Sum(o => o.Value);
        for (var i = 0; i < law.Values.Count; i++)
        {
            expected += n * law.Probabilities[i];
            seen += observed.GetValueOrDefault(law.Values[i]);
            if (i == law.Values.Count - 1) seen += observed.Where(o => o.Key > law.Values[^1]).Sum(o => o.Value);
            if (expected >= 5 || i == law.Values.Count - 1)
            {
                cells.Add((expected, seen));
                expected = 0;
                seen = 0;
            }
        }
        if (cells.Count > 1 && cells[^1].Expected < 5)
        {
            var last = cells[^1];
            cells.RemoveAt(cells.Count - 1);
            cells[^1] = (cells[^1].Expected + last.Expected, cells[^1].Observed + last.Observed);
        }
        return (cells.Sum(c => (c.Observed - c.Expected) * (c.Observed - c.Expected) / c.Expected), cells.Count);
    }
}
