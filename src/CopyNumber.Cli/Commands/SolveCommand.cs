using CopyNumber.Analysis.Oscillation;
using CopyNumber.Analysis.Verdicts;
using System.CommandLine;
using CopyNumber.Cli.Rendering;
using CopyNumber.Deterministic;
using CopyNumber.Storage;
using CopyNumber.Network;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber solve MODEL --until T --every DT</c>: the rate equations dx/dt = N·v on a grid.</summary>
internal static class SolveCommand
{
    public static Command Create()
    {
        var model = ModelArgument.Create();
        var grid = new GridOptions();
        var output = new Option<string?>("--out") { Description = "Write the solution to this Parquet file." };
        var force = new Option<bool>("--force") { Description = "Replace the --out file when it exists." };
        var solver = new Option<string>("--solver") { Description = "auto (default: explicit, switching to stiff when needed), explicit (Dormand-Prince 5(4)) or stiff (Rosenbrock).", DefaultValueFactory = _ => "auto" };
        solver.AcceptOnlyFromAmong("auto", "explicit", "stiff");
        var rtol = new Option<double>("--rtol") { Description = "Relative error tolerance per step.", DefaultValueFactory = _ => 1e-6 };
        var atol = new Option<double>("--atol") { Description = "Absolute error tolerance per step, in copies.", DefaultValueFactory = _ => 1e-9 };
        var signed = new Option<bool>("--signed-rates") { Description = "Accept rate laws that go below zero, as the net law of a reversible reaction imported from SBML as one column; without it solve stops there, as simulate does." };

        var command = new Command("solve", "Integrate the deterministic rate equations dx/dt = N v from the initial counts.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        command.Options.Add(output);
        command.Options.Add(force);
        command.Options.Add(solver);
        command.Options.Add(rtol);
        command.Options.Add(atol);
        command.Options.Add(signed);
        command.SetAction(parsed =>
        {
            var timeGrid = grid.Read(parsed);
            var options = ReadSolverOptions(parsed.GetValue(solver)!, parsed.GetValue(rtol), parsed.GetValue(atol)) with { RefuseNegativeRates = !parsed.GetValue(signed) };
            OutputFile.Check(parsed.GetValue(output), parsed.GetValue(force), "solution.parquet");
            var loaded = ModelArgument.Load(parsed.GetValue(model)!, warnings: parsed.InvocationConfiguration.Error);
            var solution = RateEquationSolver.Solve(loaded.Network, timeGrid, options);
            var writer = parsed.InvocationConfiguration.Output;
            var path = parsed.GetValue(output);
            if (path is not null)
            {
                var arguments = new Dictionary<string, string>
                {
                    ["command"] = "solve",
                    ["until"] = Invariant(timeGrid.Until),
                    ["every"] = Invariant(timeGrid.Every),
                    ["solver"] = parsed.GetValue(solver)!,
                    ["rtol"] = Invariant(options.RelativeTolerance),
                    ["atol"] = Invariant(options.AbsoluteTolerance),
                };
                DeterministicTable.Write(path, solution, Provenance.For(loaded.Path, loaded.Text, arguments, DateTimeOffset.UtcNow));
            }
            writer.Write(Render(solution, loaded.Network.Units));
            writer.WriteLine("oscillation: " + OscillationSentence.Describe(CycleDetection.DetectForRun(loaded.Network, timeGrid.Until)));
            if (path is not null) writer.WriteLine($"wrote {Paths.Shown(path)}");
            return ExitCodes.Done;
        });
        return command;
    }

    internal static SolverOptions ReadSolverOptions(string solver, double rtol, double atol)
    {
        if (!(rtol > 0 && rtol < 1)) throw new UserInputException($"--rtol must lie in (0, 1) (got {rtol})");
        if (!(atol > 0) || double.IsInfinity(atol)) throw new UserInputException($"--atol must be positive (got {atol})");
        var kind = solver switch { "explicit" => SolverKind.Explicit, "stiff" => SolverKind.Stiff, _ => SolverKind.Auto };
        return new SolverOptions(kind, rtol, atol);
    }

    private static string Invariant(double value) => value.ToString("R", System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>At most about a dozen rows, evenly spread over the grid, always including 0 and T.</summary>
    internal static string Render(DeterministicSolution solution, ModelUnits? units = null)
    {
        var table = new TextTable(solution.Columns.Prepend((units ?? ModelUnits.None).TimeHeading).ToArray());
        var count = solution.Grid.Count;
        var step = Math.Max(1, (count - 1) / 10);
        for (var k = 0; k < count; k += step)
            table.Add(Row(solution, k));
        if ((count - 1) % step != 0) table.Add(Row(solution, count - 1));
        var stats = solution.Statistics;
        return table + $"solver: {stats.MethodsUsed}; {stats.Steps} steps ({stats.RejectedSteps} rejected), {stats.FunctionEvaluations} rate evaluations"
            + (stats.StiffnessDetected ? ", stiffness detected" : "") + "\n";
    }

    private static string[] Row(DeterministicSolution solution, int k) =>
        Enumerable.Range(0, solution.Columns.Count).Select(c => Numbers.Format(solution.Values[k, c], 5))
            .Prepend(Numbers.Format(solution.Grid[k], 6)).ToArray();
}
