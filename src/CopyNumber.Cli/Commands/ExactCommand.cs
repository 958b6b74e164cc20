using CopyNumber.Runs;
using System.CommandLine;
using System.Globalization;
using CopyNumber.Cli.Rendering;
using CopyNumber.MasterEquation;
using CopyNumber.Storage;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// <c>copynumber exact MODEL --until T --every DT</c>: the chemical master equation by finite state projection,
/// written as a run folder <c>contrast</c> reads. A model the solver refuses, or a projection beyond
/// --max-states, exits 2 with the reason.
/// </summary>
internal static class ExactCommand
{
    public static Command Create(CliSession session)
    {
        var model = ModelArgument.Create();
        var grid = new GridOptions();
        var tolerance = new Option<double>("--tolerance") { Description = "Largest probability allowed outside the projection at any grid time (projection and time stepping together).", DefaultValueFactory = _ => 1e-6 };
        var maxStates = CountOption.Create("--max-states", "Largest projection allowed (default: what fits in half the available memory).");
        var stationary = new Option<bool>("--stationary") { Description = "Also solve for the stationary law on the final projection (stationary.parquet)." };
        var threads = new Option<int>("--threads") { Description = "Threads for the sparse products (default: all cores).", DefaultValueFactory = _ => 0 };
        var joint = new Option<string?>("--joint") { Description = "Two species, as A,B: also write their joint law at every grid time (joint.parquet)." };
        var output = new Option<string?>("--out") { Description = "Output folder (default: <model>-<start time> in the current folder)." };
        var force = new Option<bool>("--force") { Description = "Write into an existing, non-empty output folder." };
        var command = new Command("exact", "Solve the chemical master equation by finite state projection: every quantity's law at every grid time, with a bound on its error; write a run folder that 'contrast' reads.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        foreach (var option in new Option[] { tolerance, maxStates, stationary, threads, joint, output, force }) command.Options.Add(option);
        command.SetAction(parsed =>
        {
            var timeGrid = grid.Read(parsed);
            var epsilon = parsed.GetValue(tolerance);
            if (!(epsilon > 0 && epsilon < 1)) throw new UserInputException($"--tolerance must lie in (0, 1) (got {epsilon})");
            var threadCount = parsed.GetValue(threads);
            if (threadCount < 0) throw new UserInputException($"--threads must be 0 (all cores) or more (got {threadCount})");
            var loaded = ModelArgument.Load(parsed.GetValue(model)!);
            var network = loaded.Network;
            var coding = StateCoding.For(network);
            var limit = parsed.GetValue(maxStates) ?? ExactOptions.DefaultMaxStates(coding.Dimension, network.Reactions.Count);
            if (limit < 1) throw new UserInputException($"--max-states must be at least 1 (got {limit})");
            var options = new ExactOptions(epsilon, limit, threadCount) { Joint = JointPair(parsed.GetValue(joint), network) };
            var arguments = new Dictionary<string, string>
            {
                ["command"] = "exact",
                ["until"] = Invariant(timeGrid.Until),
                ["every"] = Invariant(timeGrid.Every),
                ["tolerance"] = Invariant(epsilon),
                ["max_states"] = limit.ToString(CultureInfo.InvariantCulture),
                ["stationary"] = parsed.GetValue(stationary) ? "true" : "false",
            };
            if (parsed.GetValue(joint) is { } jointText) arguments["joint"] = jointText;
            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;
            using var claim = OutputFolder.Claim(parsed.GetValue(output), network.Name, DateTimeOffset.Now, parsed.GetValue(force), takeOver: false, "exact");
            var folder = claim.Folder;
            error.WriteLine($"solving the master equation of {network.Name}: tolerance {epsilon:G3}, at most {limit:N0} states, {coding.Dimension} stored coordinate{(coding.Dimension == 1 ? "" : "s")} per state -> {Paths.Shown(folder)}");
            var outcome = ExactRun.Execute(new ExactRequest(loaded, timeGrid, options, folder, arguments, parsed.GetValue(stationary)), session.Interrupt);
            writer.Write(Render(outcome));
            writer.WriteLine($"wrote {Paths.Shown(folder)}");
            return ExitCodes.Done;
        });
        return command;
    }

    /// <summary>Means, SDs and the bound at about a dozen grid times; the stationary law's moments when solved.</summary>
    internal static string Render(ExactOutcome outcome)
    {
        var solution = outcome.Solution;
        var headers = new List<string> { "time" };
        foreach (var q in solution.Quantities) { headers.Add(q.Name + " mean"); headers.Add(q.Name + " sd"); }
        headers.Add("bound");
        headers.Add("states");
        var table = new TextTable(headers.ToArray());
        var count = solution.Grid.Count;
        var step = Math.Max(1, (count - 1) / 10);
        var rows = Enumerable.Range(0, count).Where(k => k % step == 0 || k == count - 1);
        foreach (var k in rows)
        {
            var cells = new List<string> { Numbers.Format(solution.Grid[k], 6) };
            for (var q = 0; q < solution.Quantities.Count; q++)
            {
                var law = solution.Law(k, q);
                cells.Add(Numbers.Format(law.Mean, 6));
                cells.Add(Numbers.Format(Math.Sqrt(law.Variance), 5));
            }
            cells.Add(solution.Bound[k].ToString("0.0e+0", CultureInfo.InvariantCulture));
            cells.Add(solution.States[k].ToString(CultureInfo.InvariantCulture));
            table.Add(cells.ToArray());
        }
        var text = table + $"finite state projection: {solution.States[^1]:N0} states at the end, largest bound {solution.Bound.Max():G3} "
            + $"(of which time stepping at most {solution.SteppingError[^1]:G3}); uniformisation rate {solution.LargestRate:G4}, {solution.Products:N0} sparse products ({solution.KrylovSteps:N0} Krylov steps, their error estimate {solution.KrylovError:G3}), {solution.WallTime.TotalSeconds:F2} s\n";
        if (outcome.Stationary is { } s)
        {
            text += "stationary law on the final projection: "
                + string.Join(", ", s.Quantities.Select((q, i) => $"{q.Name} mean {Numbers.Format(s.Laws[i].Mean, 6)} sd {Numbers.Format(Math.Sqrt(s.Laws[i].Variance), 5)}"))
                + $"; relative residual {s.Residual:G3} after {s.Sweeps} sweeps, mass on the projection's boundary {s.BoundaryMass:G3}\n";
        }
        return text;
    }

    /// <summary>The species indices named by --joint A,B, or null when it was not given.</summary>
    private static (int, int)? JointPair(string? text, CopyNumber.Network.ReactionNetwork network)
    {
        if (text is null) return null;
        var names = text.Split(',', StringSplitOptions.TrimEntries);
        if (names.Length != 2 || names[0] == names[1])
            throw new UserInputException($"--joint takes two different species as A,B (got '{text}')");
        int Index(string name)
        {
            for (var i = 0; i < network.Species.Count; i++) if (network.Species[i] == name) return i;
            throw new UserInputException($"--joint: '{name}' is not a species of the model (species: {string.Join(", ", network.Species)})");
        }
        return (Index(names[0]), Index(names[1]));
    }

    private static string Invariant(double value) => value.ToString("R", CultureInfo.InvariantCulture);
}
