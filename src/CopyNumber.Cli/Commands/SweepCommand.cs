using System.CommandLine;
using System.Globalization;
using System.Security.Cryptography;
using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Output;
using CopyNumber.Reports;
using CopyNumber.Stochastic;
using CopyNumber.Cli.Rendering;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// <c>copynumber sweep MODEL --sizes 1,10,100 ...</c>: the same model at several system sizes Ω
/// (initial counts scaled by Ω/Ω₀, concentrations unchanged), to find from which size on the rate
/// equations are adequate.
/// </summary>
internal static class SweepCommand
{
    public static Command Create(CliSession session)
    {
        var model = ModelArgument.Create();
        var grid = new GridOptions();
        var sizes = new Option<string>("--sizes") { Description = "System sizes Ω, comma-separated, e.g. 1,10,100,1000.", Required = true };
        var replicates = new Option<long>("--replicates") { Description = "Replicates at each size.", Required = true };
        var method = new Option<string>("--method") { Description = "Simulation method, as for simulate (auto chooses at each size).", DefaultValueFactory = _ => "auto" };
        method.AcceptOnlyFromAmong(MethodArgument.Names);
        var epsilon = new Option<double>("--epsilon") { Description = "Tau-leaping error control in (0, 1).", DefaultValueFactory = _ => 0.03 };
        var seed = new Option<ulong?>("--seed") { Description = "Run seed, shared by every size; drawn and recorded when absent." };
        var threads = new Option<int>("--threads") { Description = "Worker threads.", DefaultValueFactory = _ => Environment.ProcessorCount };
        var output = new Option<string?>("--out") { Description = "Output folder (default: <model>-sweep-<start time>)." };
        var force = new Option<bool>("--force") { Description = "Write into an existing, non-empty folder." };
        var contrastOptions = new ContrastOptions();

        var command = new Command("sweep", "Simulate the model at several system sizes and report from which size the rate equations are adequate.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        foreach (var option in new Option[] { sizes, replicates, method, epsilon, seed, threads, output, force })
            command.Options.Add(option);
        contrastOptions.AddTo(command);

        command.SetAction(parsed =>
        {
            var timeGrid = grid.Read(parsed);
            var sizeList = ReadSizes(parsed.GetValue(sizes)!);
            var replicateCount = parsed.GetValue(replicates);
            if (replicateCount < 1) throw new UserInputException($"--replicates must be at least 1 (got {replicateCount})");
            var eps = parsed.GetValue(epsilon);
            if (!(eps > 0 && eps < 1)) throw new UserInputException($"--epsilon must lie in (0, 1) (got {eps})");
            var threadCount = parsed.GetValue(threads);
            if (threadCount < 1) throw new UserInputException($"--threads must be at least 1 (got {threadCount})");
            var thresholds = contrastOptions.Thresholds(parsed);
            var chosen = parsed.GetValue(method)!;
            var runSeed = parsed.GetValue(seed) ?? BitConverter.ToUInt64(RandomNumberGenerator.GetBytes(8));
            var modelPath = parsed.GetValue(model)!;
            var baseModel = ModelArgument.Load(modelPath);
            ModelSupport.RequireStochastic(baseModel.Network); // before anything is written
            var (histogramTimes, heatmap) = contrastOptions.Figures(parsed, baseModel.Network, timeGrid.Until);
            var root = OutputFolder.CreateFresh(parsed.GetValue(output), baseModel.Network.Name + "-sweep", DateTimeOffset.Now, parsed.GetValue(force));
            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;

            var runs = new List<(double, RunContrastResult)>();
            using var honouring = session.Honour();
            foreach (var size in sizeList)
            {
                var loaded = ModelArgument.Load(modelPath, new CompileOptions(SizeOverride: size));
                // Copy numbers grow with the size, so auto may choose differently at each size.
                var (simulationMethod, methodReason) = MethodArgument.Resolve(chosen, loaded.Network, timeGrid);
                var folder = Path.Combine(root, "size-" + size.ToString("R", CultureInfo.InvariantCulture));
                Directory.CreateDirectory(folder);
                var arguments = new Dictionary<string, string>
                {
                    ["command"] = "sweep",
                    ["size"] = size.ToString("R", CultureInfo.InvariantCulture),
                    ["until"] = timeGrid.Until.ToString("R", CultureInfo.InvariantCulture),
                    ["every"] = timeGrid.Every.ToString("R", CultureInfo.InvariantCulture),
                    ["replicates"] = replicateCount.ToString(CultureInfo.InvariantCulture),
                    ["method"] = chosen,
                    ["epsilon"] = eps.ToString("R", CultureInfo.InvariantCulture),
                    ["seed"] = runSeed.ToString(CultureInfo.InvariantCulture),
                };
                var options = new EnsembleOptions
                {
                    Grid = timeGrid,
                    Replicates = replicateCount,
                    Seed = runSeed,
                    Method = simulationMethod,
                    Simulator = new SimulatorOptions(Epsilon: eps),
                    Threads = threadCount,
                };
                error.WriteLine($"size {size.ToString(CultureInfo.InvariantCulture)}: {replicateCount} replicates, {methodReason} -> {Paths.Shown(folder)}");
                var monitor = new EnsembleMonitor();
                SimulationOutcome outcome;
                using (new Rendering.ProgressDisplay(monitor, replicateCount, error, terminal: !Console.IsErrorRedirected && error == Console.Error))
                    outcome = SimulationRun.Execute(new SimulationRequest(loaded, options, folder, new SolverOptions(), arguments, methodReason), monitor, session.Interrupt);
                if (outcome.Ensemble.Interrupted)
                {
                    error.WriteLine($"interrupted during size {size}: the sizes finished so far are in {Paths.Shown(root)}");
                    return ExitCodes.Interrupted;
                }
                var (contrast, _) = ContrastOutputs.Write(folder, thresholds, histogramTimes, heatmap);
                runs.Add((size, contrast));
            }

            var sweep = SizeSweep.Summarise(runs);
            var metadata = Provenance.For(baseModel.Path, baseModel.Text,
                new Dictionary<string, string> { ["command"] = "sweep", ["sizes"] = parsed.GetValue(sizes)!, ["seed"] = runSeed.ToString(CultureInfo.InvariantCulture) },
                DateTimeOffset.UtcNow);
            SweepTable.Write(Path.Combine(root, "sweep.parquet"), sweep, metadata);
            var report = SweepReport.Build(baseModel.Network.Name, sweep, thresholds);
            ReportWriter.WriteMarkdown(report, root, "report.md");
            ReportWriter.WriteHtml(report, Path.Combine(root, "report.html"));

            var table = new Rendering.TextTable("quantity", "size", "max rel. deviation", "cv", "var/LNA", "verdicts");
            foreach (var p in sweep.Points)
                table.Add(p.Quantity, Rendering.Numbers.Format(p.Size), double.IsNaN(p.RelativeDeviation) ? "-" : Rendering.Numbers.Format(p.RelativeDeviation, 3),
                    Rendering.Numbers.Format(p.CoefficientOfVariation, 3), Rendering.Numbers.Format(p.VarianceRatio, 3), p.Verdicts);
            writer.Write(table.ToString());
            foreach (var (quantity, from) in sweep.AdequateFrom)
                writer.WriteLine(from is { } f ? $"{quantity}: adequate from size {Rendering.Numbers.Format(f)} on" : $"{quantity}: not adequate at any size tried");
            writer.WriteLine($"wrote {Paths.Shown(root)}");
            return ExitCodes.Done;
        });
        return command;
    }

    private static double[] ReadSizes(string text)
    {
        var sizes = new List<double>();
        foreach (var part in text.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries))
        {
            if (!double.TryParse(part, NumberStyles.Float, CultureInfo.InvariantCulture, out var size) || !(size > 0) || double.IsInfinity(size))
                throw new UserInputException($"--sizes takes positive numbers separated by commas (got '{part}')");
            sizes.Add(size);
        }
        if (sizes.Count == 0) throw new UserInputException("--sizes needs at least one size");
        return sizes.Distinct().Order().ToArray();
    }
}
