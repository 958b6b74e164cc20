using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Analysis;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Network;

/// <summary>
/// What the compiler makes of the second edition's forms: a 'back' clause, held species, repeating and
/// grouped changes, state-triggered changes (refused by every method), non-integer initial amounts and a
/// declared time unit. Expected matrices, propensities and solutions are written out in each test from
/// the definitions (mass action as in Gillespie 1977, J. Phys. Chem. 81:2340; dx/dt = N·v), independently
/// of the compiler.
/// </summary>
public sealed class SecondEditionCompilationTests
{
    private const string Dimerisation = """
        species
          P = 40
          D = 3
        parameters
          kf = 0.02
          kr = 0.7
        reactions
          pair: 2 P -> D  mass kf  back mass kr
        """;

    [Fact]
    public void A_back_clause_gives_the_two_columns_of_N_of_the_old_two_reaction_model()
    {
        var network = AnalysisModels.Compile(Dimerisation);
        // N written by hand: pair_fwd takes two P and makes one D; pair_rev undoes it.
        long[,] expected = { { -2, 2 }, { 1, -1 } };
        Assert.Equal(["pair_fwd", "pair_rev"], network.Reactions.Select(r => r.Name));
        Assert.Equal(expected, network.Stoichiometry.ToDense());
    }

    [Fact]
    public void A_back_clause_gives_the_propensities_of_the_old_two_reaction_model_at_random_states()
    {
        // The first edition's expansion, written as two one-way reactions, is the reference.
        var twoReactions = AnalysisModels.Compile(Dimerisation.Replace("pair: 2 P -> D  mass kf  back mass kr",
            "pair_fwd: 2 P -> D  mass kf\n  pair_rev: D -> 2 P  mass kr"));
        var back = AnalysisModels.Compile(Dimerisation);
        var random = new Random(12);
        var (constantsA, constantsB) = (new double[2], new double[2]);
        back.Propensities.ComputeConstants([0.02, 0.7], constantsA);
        twoReactions.Propensities.ComputeConstants([0.02, 0.7], constantsB);
        for (var trial = 0; trial < 50; trial++)
        {
            long[] counts = [random.Next(0, 200), random.Next(0, 200)];
            for (var j = 0; j < 2; j++)
            {
                var a = back.Propensities.Evaluate(j, counts, constantsA, [0.02, 0.7]);
                Assert.Equal(twoReactions.Propensities.Evaluate(j, counts, constantsB, [0.02, 0.7]), a);
            }
            // and the definitions at Ω = 1: a_fwd = kf·P(P − 1), a_rev = kr·D
            Assert.Equal(0.02 * counts[0] * (counts[0] - 1), back.Propensities.Evaluate(0, counts, constantsA, [0.02, 0.7]), 1e-12);
            Assert.Equal(0.7 * counts[1], back.Propensities.Evaluate(1, counts, constantsA, [0.02, 0.7]), 1e-12);
        }
    }

    [Fact]
    public void A_back_clause_may_hold_a_rate_law_of_its_own()
    {
        var network = AnalysisModels.Compile("""
            species
              A = 5
              B = 7
              C = 2
            parameters
              kon = 0.3
              koff = 0.4
            reactions
              bind: A + B -> C  rate kon*A*B  back mass koff
            """);
        long[,] expected = { { -1, 1 }, { -1, 1 }, { 1, -1 } };
        Assert.Equal(expected, network.Stoichiometry.ToDense());
        var constants = new double[2];
        double[] parameters = [0.3, 0.4];
        network.Propensities.ComputeConstants(parameters, constants);
        Assert.Equal(0.3 * 5 * 7, network.Propensities.Evaluate(0, [5, 7, 2], constants, parameters), 1e-12);
        Assert.Equal(0.4 * 2, network.Propensities.Evaluate(1, [5, 7, 2], constants, parameters), 1e-12);
        Assert.Equal(LawKind.Rate, network.Reactions[0].Law);
        Assert.Equal(LawKind.Mass, network.Reactions[1].Law);
    }

    [Fact]
    public void A_held_species_has_a_zero_row_in_N_and_is_still_read_by_the_laws()
    {
        var network = AnalysisModels.Compile("""
            species
              S = 50 held
              P = 0
            parameters
              k = 0.1
              d = 1
            reactions
              convert: S -> P  mass k
              decay: P -> 0  mass d
            """);
        // N by hand with S's row dropped (the SBML boundary-species rule): convert makes P only.
        long[,] expected = { { 0, 0 }, { 1, -1 } };
        Assert.Equal(expected, network.Stoichiometry.ToDense());
        Assert.Equal([true, false], network.Held);
        var constants = new double[2];
        network.Propensities.ComputeConstants([0.1, 1], constants);
        Assert.Equal(0.1 * 50, network.Propensities.Evaluate(0, [50, 0], constants, [0.1, 1]), 1e-12);

        // dP/dt = k·S − d·P with S held at 50: P(t) = (k·S/d)(1 − e^(−d·t)), the closed form of a linear ODE.
        var grid = new TimeGrid(4, 1);
        var solution = RateEquationSolver.Solve(network, grid, AnalysisModels.Tight);
        for (var i = 0; i < grid.Count; i++)
        {
            Assert.Equal(50, solution[i, 0]);
            Assert.Equal(5 * (1 - Math.Exp(-grid[i])), solution[i, 1], 1e-8);
        }
    }

    private const string Halving = """
        species
          X = 1024
        parameters
          k = 0
        reactions
          decay: X -> 0  mass k
        changes
          X = X / 2  every 30 from 30 until 90
        """;

    [Fact]
    public void A_repeating_change_expands_into_the_one_timeline_until_its_last_time_inclusive()
    {
        var timeline = Timeline.Of(AnalysisModels.Compile(Halving), new TimeGrid(200, 10));
        // 30, 60 and 90: 'until' is inclusive
        Assert.Equal([30.0, 60.0, 90.0], timeline.Changes.ToArray().Select(c => c.Time));
        var solution = RateEquationSolver.Solve(AnalysisModels.Compile(Halving), new TimeGrid(200, 10), AnalysisModels.Tight);
        // nothing reacts (k = 0), so X halves exactly at each change: 1024, 512, 256, 128
        Assert.Equal(1024, solution[2, 0]);
        Assert.Equal(512, solution[3, 0]);
        Assert.Equal(256, solution[6, 0]);
        Assert.Equal(128, solution[9, 0]);
        Assert.Equal(128, solution[20, 0]);
    }

    [Fact]
    public void A_repeating_change_without_until_runs_to_the_final_time_and_without_from_starts_one_period_in()
    {
        var network = AnalysisModels.Compile(Halving.Replace("every 30 from 30 until 90", "every 25"));
        var timeline = Timeline.Of(network, new TimeGrid(100, 10));
        Assert.Equal([25.0, 50.0, 75.0, 100.0], timeline.Changes.ToArray().Select(c => c.Time));
    }

    [Fact]
    public void The_last_instance_survives_the_round_off_of_k_times_the_period()
    {
        // 3 × 0.1 = 0.30000000000000004 > 0.3: inclusive within 10⁻⁹·period, so the change at 0.3 happens.
        var network = AnalysisModels.Compile(Halving.Replace("every 30 from 30 until 90", "every 0.1 from 0 until 0.3"));
        Assert.Equal(4, Timeline.Of(network, new TimeGrid(1, 0.05)).Changes.Length);
    }

    [Fact]
    public void Instances_of_repeating_changes_and_single_changes_apply_in_file_order_at_a_shared_time()
    {
        // At t = 60 the single change (line 1 of the changes) comes first, then the halving (line 2), so X = (7) / 2.
        var network = AnalysisModels.Compile("""
            species
              X = 1024
            parameters
              k = 0
            reactions
              decay: X -> 0  mass k
            changes
              X = 7  at time 60
              X = X / 2  every 30
            """);
        var changes = Timeline.Of(network, new TimeGrid(90, 30)).Changes.ToArray();
        Assert.Equal([(30.0, "X"), (60.0, "X"), (60.0, "X"), (90.0, "X")], changes.Select(c => (c.Time, c.TargetName)));
        Assert.Equal([ScheduleOperation.Set, ScheduleOperation.Set], changes.Skip(1).Take(2).Select(c => c.Operation));
        var solution = RateEquationSolver.Solve(network, new TimeGrid(90, 30), AnalysisModels.Tight);
        Assert.Equal([1024, 512, 3.5, 1.75], Enumerable.Range(0, 4).Select(i => solution[i, 0]));
    }

    [Fact]
    public void Assignments_separated_by_commas_apply_in_order_at_their_time()
    {
        // A = 5, then B = A + 1 sees the new A: B = 6.
        var network = AnalysisModels.Compile("""
            species
              A = 1
              B = 1
            parameters
              k = 0
            reactions
              decay: A -> 0  mass k
            changes
              A = 5, B = A + 1  at time 2
            """);
        var solution = RateEquationSolver.Solve(network, new TimeGrid(3, 1), AnalysisModels.Tight);
        Assert.Equal((5.0, 6.0), (solution[3, 0], solution[3, 1]));
    }

    private const string Triggered = """
        species
          P = 100
          P2 = 0
        parameters
          k1 = 0.001
          k2 = 0.01
        reactions
          pair: 2 P -> P2  mass k1  back mass k2
        changes
          P = 100, P2 = 0  whenever P2 > 30 and not P < 10
        """;

    [Fact]
    public void A_trigger_is_compiled_onto_the_network_with_its_condition_and_assignments()
    {
        var network = AnalysisModels.Compile(Triggered);
        var trigger = Assert.Single(network.Triggers);
        Assert.Equal(10, trigger.Position.Line);
        Assert.Equal(["P", "P2"], trigger.Assignments.Select(a => a.TargetName));
        Assert.All(trigger.Assignments, a => Assert.True(double.IsNaN(a.Time)));
        // the condition as a number: 1 while it holds, 0 otherwise
        Assert.Equal(1, trigger.OnCounts([50, 31], [0.001, 0.01]));
        Assert.Equal(0, trigger.OnCounts([50, 30], [0.001, 0.01]));
        Assert.Equal(0, trigger.OnCounts([9, 31], [0.001, 0.01]));
        Assert.Equal(1, trigger.OnState([10, 30.5], [0.001, 0.01]));
    }

    [Fact]
    public void The_expansions_stop_at_the_first_trigger_and_say_which()
    {
        // Dimerisation from P = 100, P2 = 0: the rate equations' P2 rises monotonically until it passes 30,
        // where the reset drops it to 0 (the first grid time after that is the first where P2 falls); the
        // linear noise approximation stops there, the rate equations carry on.
        var network = AnalysisModels.Compile(Triggered);
        var grid = new TimeGrid(50, 0.5);
        var rate = RateEquationSolver.Solve(network, grid, AnalysisModels.Tight);
        var crossing = Enumerable.Range(1, grid.Count - 1).First(k => rate[k, 1] < rate[k - 1, 1]);
        Assert.True(rate[crossing - 1, 1] <= 30 && rate[crossing - 1, 1] > 25, $"P2 = {rate[crossing - 1, 1]} just before the reset");
        var lna = LinearNoiseApproximation.Solve(network, grid, AnalysisModels.Tight);
        Assert.InRange(lna.StoppedAt, grid[crossing - 1], grid[crossing]);
        Assert.Equal(10, lna.StoppedBy!.Position.Line);
        Assert.False(double.IsNaN(lna.Variance(crossing - 1, 1)));
        Assert.True(double.IsNaN(lna.Variance(crossing, 1)));
    }

    [Fact]
    public void Simulate_runs_a_trigger_and_says_the_verdicts_stop_at_the_first_one()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("triggered.cnet");
        File.WriteAllText(model, Triggered);
        var output = Path.Combine(scratch.Path, "out");
        var run = CliRun.Of(["simulate", model, "--until", "50", "--every", "1", "--out", output, "--replicates", "64", "--seed", "3"]);
        Assert.True(run.ExitCode == 0, run.Error);
        Assert.Contains("stop at the first state-triggered change ('P = 100, P2 = 0  whenever P2 > 30 and not P < 10', line 10)", run.Output);
        Assert.Contains("the verdicts cover only the grid times before it", run.Output);
    }

    private const string Fractional = """
        time unit hour
        species
          A = 20.5
        parameters
          k = 0.3
        reactions
          decay: A -> 0  mass k
        """;

    [Fact]
    public void A_non_integer_amount_starts_the_rate_equations_and_the_expansion_where_declared()
    {
        var network = AnalysisModels.Compile(Fractional);
        Assert.Equal(20.5, network.InitialAmounts[0]);
        var grid = new TimeGrid(2, 0.5);
        var solution = RateEquationSolver.Solve(network, grid, AnalysisModels.Tight);
        var lna = LinearNoiseApproximation.Solve(network, grid, AnalysisModels.Tight);
        for (var i = 0; i < grid.Count; i++)
        {
            // dA/dt = −k·A: A(t) = A0·e^(−k·t), the closed form of first-order decay
            var exact = 20.5 * Math.Exp(-0.3 * grid[i]);
            Assert.Equal(exact, solution[i, 0], exact * 1e-8);
            Assert.Equal(exact, lna.RateEquationColumn(0)[i], exact * 1e-8);
        }
    }

    [Fact]
    public void Stochastic_runs_refuse_a_non_integer_amount_with_exit_code_2()
    {
        var network = AnalysisModels.Compile(Fractional);
        var refusal = Assert.Throws<UnsupportedModelException>(() => SimulatorFactory.Create(SimulationMethod.Direct, network, new SimulatorOptions()));
        Assert.Contains("species 'A' starts at 20.5, not a whole number of molecules", Assert.Single(refusal.Problems).Message);

        using var scratch = new ScratchFolder();
        var model = scratch.File("fractional.cnet");
        File.WriteAllText(model, Fractional);
        var run = CliRun.Of("simulate", model, "--until", "5", "--every", "1", "--replicates", "16", "--out", Path.Combine(scratch.Path, "run"));
        Assert.Equal(2, run.ExitCode);
        Assert.StartsWith($"{model}:3:3: error: species 'A' starts at 20.5", run.Error);
    }

    [Fact]
    public void The_declared_time_unit_is_on_the_network_and_heads_the_time_column_of_solve()
    {
        var network = AnalysisModels.Compile(Fractional);
        Assert.Equal(new ModelUnits("hour", null), network.Units);
        using var scratch = new ScratchFolder();
        var model = scratch.File("fractional.cnet");
        File.WriteAllText(model, Fractional);
        var run = CliRun.Of("solve", model, "--until", "1", "--every", "1");
        Assert.Equal(0, run.ExitCode);
        Assert.StartsWith("time (hour)", run.Output);
    }

    [Fact]
    public void The_declared_time_unit_is_recorded_in_the_manifest()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("unit.cnet");
        File.WriteAllText(model, "time unit minute\nspecies\n  A = 10\nreactions\n  decay: A -> 0  mass 0.1\n");
        var folder = Path.Combine(scratch.Path, "run");
        var run = CliRun.Of("simulate", model, "--until", "2", "--every", "1", "--replicates", "8", "--seed", "3", "--out", folder);
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("\"time_unit\": \"minute\"", File.ReadAllText(Path.Combine(folder, "manifest.json")));
        Assert.Contains("at t = 2 minute:", run.Output);
    }
}
