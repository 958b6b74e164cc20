using CopyNumber.Runs;
using System.CommandLine;
using System.Globalization;
using System.Security.Cryptography;
using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;
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
        var ensemble = new EnsembleOptionSet("Replicates at each size (required).", withShard: false);
        var output = new Option<string?>("--out") { Description = "Output folder (default: <model>-sweep-<start time>)." };
        var force = new Option<bool>("--force") { Description = "Replace the sweep in an existing, non-empty folder: its files are removed first (a folder holding files copynumber did not write is refused)." };
        var contrastOptions = new ContrastOptions();

        var command = new Command("sweep", "Simulate the model at several system sizes and report from which size the rate equations are adequate.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        ensemble.AddTo(command);
        foreach (var option in new Option[] { sizes, output, force })
            command.Options.Add(option);
        contrastOptions.AddTo(command);

        command.SetAction(parsed =>
        {
            var timeGrid = grid.Read(parsed);
            var sizeList = ReadSizes(parsed.GetValue(sizes)!);
            var thresholds = contrastOptions.Thresholds(parsed);
            var modelPath = parsed.GetValue(model)!;
            var baseModel = ModelArgument.Load(modelPath);
            ModelSupport.RequireSimulation(baseModel.Network); // before anything is written
            ModelSupport.RequireRateEquations(baseModel.Network); // the contrast needs the rate equations too
            // A sweep whose laws never read the size would only start the same dynamics elsewhere (issue 14).
            if (Runs.Scans.SizeDependence.WhySweepChangesNothing(baseModel) is { } why) throw new UserInputException(why);
            // One seed for every size, drawn once when not given.
            var baseSpecification = ensemble.Bind(parsed, baseModel, timeGrid, stored: null, "sweep");
            var (histogramTimes, heatmap) = contrastOptions.Figures(parsed, baseModel.Network, timeGrid.Until);
            using var claim = OutputFolder.Claim(parsed.GetValue(output), baseModel.Network.Name + "-sweep", DateTimeOffset.Now, parsed.GetValue(force), takeOver: false, "sweep");
            var root = claim.Folder;
            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;

            var runs = new List<(double, RunContrastResult)>();
            foreach (var size in sizeList)
            {
                var loaded = ModelArgument.Load(modelPath, new CompileOptions(SizeOverride: size));
                var specification = baseSpecification with { Model = loaded, Size = size };
                var folder = Path.Combine(root, "size-" + size.ToString("R", CultureInfo.InvariantCulture));
                Directory.CreateDirectory(folder);
                // Copy numbers grow with the size, so auto may choose differently at each size.
                var plan = RunPlan.Make(specification);
                SimulationOutcome outcome;
                using (session.Honour())
                {
                    error.WriteLine($"size {size.ToString(CultureInfo.InvariantCulture)}: {specification.Replicates} replicates, {plan.MethodReason} -> {Paths.Shown(folder)}");
                    var monitor = new EnsembleMonitor();
                    using (new Rendering.ProgressDisplay(monitor, specification.Replicates, error, terminal: !Console.IsErrorRedirected && error == Console.Error))
                        outcome = SimulationRun.Execute(new SimulationRequest(plan, folder), monitor, session.Interrupt);
                }
                if (outcome.StopReason == StopReason.Interrupted)
                {
                    error.WriteLine($"interrupted during size {size}: the sizes finished so far are in {Paths.Shown(root)}");
                    return ExitCodes.Interrupted;
                }
                if (outcome.StopReason != StopReason.Finished)
                {
                    error.WriteLine(outcome.Failure is { } failure ? $"error: at size {size}: {failure}" : $"error: size {size} stopped early ({outcome.StopReason}); a sweep needs every size whole");
                    error.WriteLine($"the sizes finished so far are in {Paths.Shown(root)}");
                    return outcome.StopReason == StopReason.Failed ? ExitCodes.RunFailed : ExitCodes.Done;
                }
                var (contrast, _) = ContrastOutputs.Write(folder, thresholds, histogramTimes, heatmap);
                runs.Add((size, contrast));
            }

            var sweep = SizeSweep.Summarise(runs);
            var metadata = Provenance.For(baseModel.Path, baseModel.Text,
                new Dictionary<string, string> { ["command"] = "sweep", ["sizes"] = parsed.GetValue(sizes)!, ["seed"] = baseSpecification.Seed.ToString(CultureInfo.InvariantCulture) },
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
