using System.CommandLine;
using System.Globalization;
using System.Security.Cryptography;
using CopyNumber.Cli.Rendering;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Output;
using CopyNumber.Stochastic;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber simulate MODEL --until T --every DT --replicates R</c>: a stochastic ensemble.</summary>
internal static class SimulateCommand
{
    private static readonly string[] MethodNames = ["auto", "direct", "next-reaction", "tau-leap", "composition-rejection"];

    public static Command Create()
    {
        var model = ModelArgument.Create();
        var grid = new GridOptions();
        var replicates = new Option<long>("--replicates") { Description = "Number of independent replicates.", Required = true };
        var method = new Option<string>("--method") { Description = "auto (chosen from the network's size and copy numbers; the reason is printed), direct (Gillespie's direct method), next-reaction (Gibson-Bruck), tau-leap (adaptive explicit tau-leaping) or composition-rejection (for large networks).", DefaultValueFactory = _ => "auto" };
        method.AcceptOnlyFromAmong(MethodNames);
        var epsilon = new Option<double>("--epsilon") { Description = "Tau-leaping error control: the largest relative change of any propensity in one leap, in (0, 1).", DefaultValueFactory = _ => 0.03 };
        var seed = new Option<ulong?>("--seed") { Description = "Run seed; without it one is drawn and recorded in manifest.json." };
        var threads = new Option<int>("--threads") { Description = "Worker threads (default: all cores).", DefaultValueFactory = _ => Environment.ProcessorCount };
        var output = new Option<string?>("--out") { Description = "Output folder (default: <model>-<start time> in the current folder)." };
        var paths = new Option<string?>("--paths") { Description = "Also write paths.parquet for the first N replicates, or 'all'." };
        var force = new Option<bool>("--force") { Description = "Write into an existing, non-empty output folder." };
        var maxEvents = new Option<long?>("--max-events") { Description = "Stop a replicate after this many events; such replicates are counted and reported." };

        var command = new Command("simulate", "Run an ensemble of stochastic replicates and summarise it on the time grid beside the rate equations.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        foreach (var option in new Option[] { replicates, method, epsilon, seed, threads, output, paths, force, maxEvents })
            command.Options.Add(option);

        command.SetAction(parsed =>
        {
            var timeGrid = grid.Read(parsed);
            var replicateCount = parsed.GetValue(replicates);
            if (replicateCount < 1) throw new UserInputException($"--replicates must be at least 1 (got {replicateCount})");
            var eps = parsed.GetValue(epsilon);
            if (!(eps > 0 && eps < 1)) throw new UserInputException($"--epsilon must lie in (0, 1) (got {eps})");
            var threadCount = parsed.GetValue(threads);
            if (threadCount < 1) throw new UserInputException($"--threads must be at least 1 (got {threadCount})");
            var limit = parsed.GetValue(maxEvents) ?? long.MaxValue;
            if (limit < 1) throw new UserInputException($"--max-events must be at least 1 (got {limit})");
            var pathCount = ReadPaths(parsed.GetValue(paths), replicateCount);
            var chosen = parsed.GetValue(method)!;
            var runSeed = parsed.GetValue(seed) ?? BitConverter.ToUInt64(RandomNumberGenerator.GetBytes(8));

            var loaded = ModelArgument.Load(parsed.GetValue(model)!);
            var (simulationMethod, methodReason) = chosen switch
            {
                "auto" => MethodChooser.Choose(loaded.Network, timeGrid),
                "next-reaction" => (SimulationMethod.NextReaction, $"{chosen} was requested"),
                "tau-leap" => (SimulationMethod.TauLeap, $"{chosen} was requested"),
                "composition-rejection" => (SimulationMethod.CompositionRejection, $"{chosen} was requested"),
                _ => (SimulationMethod.Direct, $"{chosen} was requested"),
            };
            var folder = OutputFolder.CreateFresh(parsed.GetValue(output), loaded.Network.Name, DateTimeOffset.Now, parsed.GetValue(force));
            var options = new EnsembleOptions
            {
                Grid = timeGrid,
                Replicates = replicateCount,
                Seed = runSeed,
                Method = simulationMethod,
                Simulator = new SimulatorOptions(Epsilon: eps, MaxEvents: limit),
                Threads = threadCount,
                PathReplicates = pathCount,
            };
            var arguments = new Dictionary<string, string>
            {
                ["command"] = "simulate",
                ["until"] = Invariant(timeGrid.Until),
                ["every"] = Invariant(timeGrid.Every),
                ["replicates"] = replicateCount.ToString(CultureInfo.InvariantCulture),
                ["method"] = chosen,
                ["epsilon"] = Invariant(eps),
                ["seed"] = runSeed.ToString(CultureInfo.InvariantCulture),
                ["paths"] = pathCount.ToString(CultureInfo.InvariantCulture),
                ["max_events"] = limit == long.MaxValue ? "none" : limit.ToString(CultureInfo.InvariantCulture),
            };
            var request = new SimulationRequest(loaded, options, folder, new SolverOptions(), arguments, methodReason);

            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;
            error.WriteLine($"simulating {loaded.Network.Name}: {replicateCount} replicates, method {NameOf(simulationMethod)}, seed {runSeed}, {threadCount} threads -> {folder}");
            error.WriteLine($"method: {methodReason}");
            var monitor = new EnsembleMonitor();
            SimulationOutcome outcome;
            using (var interrupt = new InterruptSignal())
            using (new ProgressDisplay(monitor, replicateCount, error, terminal: !Console.IsErrorRedirected && error == Console.Error))
                outcome = SimulationRun.Execute(request, monitor, interrupt.Token);

            if (outcome.DeterministicFailure is not null)
                error.WriteLine($"warning: the rate equations could not be solved ({outcome.DeterministicFailure}); the 'deterministic' column is empty");
            writer.Write(RenderFinal(outcome));
            writer.WriteLine($"{outcome.Ensemble.ReplicatesFinished} replicates, {outcome.Ensemble.EventsFired} events in {outcome.Ensemble.WallTime.TotalSeconds:0.00} s ({Numbers.Format(outcome.Manifest.EventsPerSecond ?? 0, 3)} events/s); wrote {folder}");
            if (outcome.Ensemble.ReplicatesStoppedEarly > 0)
                error.WriteLine($"warning: {outcome.Ensemble.ReplicatesStoppedEarly} replicates reached --max-events before the final time; later grid times count fewer replicates");
            if (outcome.Ensemble.Interrupted)
            {
                error.WriteLine($"interrupted: summaries cover the {outcome.Ensemble.ReplicatesFinished} replicates finished and are marked partial");
                return ExitCodes.Interrupted;
            }
            return ExitCodes.Done;
        });
        return command;
    }

    private static string NameOf(SimulationMethod method) => method switch
    {
        SimulationMethod.NextReaction => "next-reaction",
        SimulationMethod.TauLeap => "tau-leap",
        SimulationMethod.CompositionRejection => "composition-rejection",
        _ => "direct",
    };

    private static long ReadPaths(string? text, long replicates)
    {
        if (text is null) return 0;
        if (text == "all") return replicates;
        if (!long.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var n) || n < 1)
            throw new UserInputException($"--paths takes a positive number of replicates or 'all' (got '{text}')");
        return Math.Min(n, replicates);
    }

    private static string Invariant(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>Per species and readout at the final time: ensemble mean ± standard error, rate-equation value, Fano factor.</summary>
    internal static string RenderFinal(SimulationOutcome outcome)
    {
        var result = outcome.Ensemble;
        var last = result.Grid.Count - 1;
        var table = new TextTable("quantity", "mean", "± s.e.", "rate eq.", "fano", "P(0)");
        int countIndex = 0, realIndex = 0;
        foreach (var q in result.Quantities)
        {
            var deterministic = outcome.Deterministic is { } d ? d.Values[last, d.Columns.ToList().IndexOf(q.Name)] : double.NaN;
            if (q.IsCount)
            {
                var s = DistributionSummary.From(result.Histogram(last, countIndex++));
                table.Add(q.Name, Numbers.Format(s.Mean, 5), Numbers.Format(s.StandardError, 2), Numbers.Format(deterministic, 5), Numbers.Format(s.FanoFactor, 3), Numbers.Format(s.ZeroFraction, 3));
            }
            else
            {
                var m = result.Moments(last, realIndex++);
                table.Add(q.Name, Numbers.Format(m.Mean, 5), Numbers.Format(Math.Sqrt(m.Variance / m.Count), 2), Numbers.Format(deterministic, 5), Numbers.Format(m.Variance / m.Mean, 3), "-");
            }
        }
        return $"at t = {Numbers.Format(result.Grid[last], 6)}:\n{table}";
    }
}
