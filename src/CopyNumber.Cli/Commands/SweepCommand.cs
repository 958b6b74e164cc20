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
using CopyNumber.Runs.Scans;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// <c>copynumber sweep MODEL --sizes 1,10,100 ...</c>: a scan over the system size Ω (initial counts
/// scaled by Ω/Ω₀, initial concentrations kept, mass-action constants of order m giving c = k·Ω^(1−m),
/// <c>size</c> taking the new value in every law and parameter), to find from which size on the rate
/// equations are adequate. A model whose propensities in counts do not change with Ω is refused.
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

            // A sweep is a scan over size (issue 14): each size a point with its own run folder, the same seed
            // at every size, the verdicts' error rate held over all the sizes.
            var axis = ScanAxis.Parse("size=" + string.Join(",", sizeList.Select(ScanAxis.Format)), baseModel.Network);
            var scan = new ScanRequest(baseModel, [axis], ScanDesign.Grid, baseSpecification, thresholds, root);
            var (outcome, stopped) = ScanCommand.RunPoints(session, scan, histogramTimes, heatmap, error, "sweep", "sizes");
            if (stopped is { } code) return code;
            var sweep = SizeSweep.Summarise(outcome.Cells);
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
