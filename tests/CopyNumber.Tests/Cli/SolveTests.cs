using CopyNumber.Deterministic;
using CopyNumber.Network;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

public class SolveTests
{
    [Fact]
    public void Solve_writes_Parquet_that_an_independent_reader_reads_and_it_matches_the_closed_form_of_2A_to_0()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("pair_loss.cnet");
        File.WriteAllText(model, "# illustrative: pairwise loss\nspecies\n  A = 500\nparameters\n  k = 0.001\nreactions\n  loss: 2 A -> 0 mass k\n");
        var output = scratch.File("solution.parquet");

        var run = CliRun.Of("solve", model, "--until", "10", "--every", "0.5", "--out", output, "--rtol", "1e-9", "--atol", "1e-9");

        Assert.Equal(0, run.ExitCode);
        var table = ParquetReadBack.Of(output);
        Assert.Equal(["time", "A"], table.Names);
        var time = (double[])table.Values[0];
        var a = (double[])table.Values[1];
        Assert.Equal(21, time.Length);
        for (var k = 0; k < time.Length; k++)
        {
            // dA/dt = −2k·A² (each event removes two copies), so A(t) = A0 / (1 + 2·k·A0·t): the closed form
            // of a second-order decay (e.g. Atkins & de Paula, Physical Chemistry, integrated rate laws).
            var exact = 500 / (1 + 2 * 0.001 * 500 * time[k]);
            Assert.Equal(exact, a[k], exact * 1e-7);
        }
        Assert.True(table.KeyValues.ContainsKey("copynumber.model_sha256"));
    }

    [Theory]
    [MemberData(nameof(CliRun.ScenarioNames), MemberType = typeof(CliRun))]
    public void Every_conservation_law_holds_to_1e_9_along_the_rate_equation_solution_of_every_scenario(string scenario)
    {
        // cᵀN = 0 implies d(cᵀx)/dt = cᵀN·v = 0 for any rates v, so every law must hold along any solution
        // (Heinrich & Schuster 1996, The Regulation of Cellular Systems, ch. 2), schedule changes aside.
        var loaded = ModelLoader.Load(CliRun.Scenario(scenario)).Model!;
        var network = loaded.Network;
        var structure = StoichiometricStructure.Analyze(network.Stoichiometry, network.InitialCounts);
        var scheduledSpecies = network.Schedule.Where(s => s.Target == ScheduleTarget.Species).Select(s => s.TargetIndex).ToHashSet();
        var solution = RateEquationSolver.Solve(network, new TimeGrid(200, 0.5), new SolverOptions(RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-10));
        // A cell cycle's gene doubling and division are changes too: the laws hold until the first of them.
        var firstCycleEvent = network.Cycle is { } cycle ? (cycle.Genes.Count > 0 ? cycle.GenePhase : 1) * cycle.MeanLength : double.PositiveInfinity;
        foreach (var law in structure.ConservationLaws.Where(l => !l.Species.Any(scheduledSpecies.Contains)))
        {
            var scale = Math.Max(1.0, Math.Abs(law.Total));
            for (var k = 0; k < solution.Grid.Count && solution.Grid[k] < firstCycleEvent; k++)
            {
                var value = 0.0;
                for (var i = 0; i < network.Species.Count; i++) value += law.Coefficients[i] * solution.Values[k, i];
                Assert.True(Math.Abs(value - law.Total) <= 1e-9 * scale,
                    $"{law.Describe(network.Species)} is {value} at t = {solution.Grid[k]} in {scenario}");
            }
        }
    }

    [Theory]
    [InlineData("--until", "0")]
    [InlineData("--until", "-5")]
    [InlineData("--every", "20")]
    [InlineData("--rtol", "2")]
    public void Bad_arguments_give_exit_code_2(string option, string value)
    {
        var args = new List<string> { "solve", CliRun.Scenario("promoter_switch.cnet"), "--until", "10", "--every", "1" };
        var at = args.IndexOf(option);
        if (at >= 0) args[at + 1] = value; else args.AddRange([option, value]);
        var run = CliRun.Of(args.ToArray());
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("error:", run.Error);
        Assert.DoesNotContain("   at ", run.Error);
    }
}
