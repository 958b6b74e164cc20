using System.CommandLine;
using CopyNumber.Analysis;
using CopyNumber.Cli.Rendering;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Reports;
using CopyNumber.Runs;
using CopyNumber.Runs.Scans;
using CopyNumber.Storage;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// <c>copynumber scan MODEL --vary NAME=SPEC ... --until T --every DT --replicates R</c>: one ensemble and one
/// contrast per point of a map over parameters, the size or initial counts, with the verdicts' error rate held
/// over the whole map, scan.parquet and the maps in report.html (docs/methods-analysis.md, "Scans").
/// </summary>
internal static class ScanCommand
{
    public static Command Create(CliSession session)
    {
        var model = ModelArgument.Create();
        var grid = new GridOptions();
        var vary = new Option<string[]>("--vary") { Description = "NAME=SPEC: a parameter, 'size' or a species (its initial count), with a list 1,2,5 or a range lo:hi:lin:count or lo:hi:log:count. Repeat for more names.", Required = true, AllowMultipleArgumentsPerToken = false };
        var design = new Option<string?>("--design") { Description = "grid (every combination, the default) or latin:N (a Latin hypercube of N points within the ranges)." };
        var ensemble = new EnsembleOptionSet("Replicates at each point (required).", withShard: false);
        var shard = new Option<string?>("--shard") { Description = "Run part i of n of the points (e.g. 2/4): point p belongs to part (p mod n) + 1. Combine the parts with 'copynumber merge'." };
        var output = new Option<string?>("--out") { Description = "Scan folder (default: <model>-scan-<start time>)." };
        var force = new Option<bool>("--force") { Description = "Replace a scan in an existing, non-empty folder (its files are removed first)." };
        var resume = new Option<bool>("--resume") { Description = "Continue the scan in --out: finished points are kept, an interrupted point is resumed, the rest are run. The other options must be those of the scan." };
        var contrastOptions = new ContrastOptions();
        var command = new Command("scan", "Simulate the model at every point of a map over parameters, size or initial counts, and map where the rate equations are adequate.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        ensemble.AddTo(command);
        foreach (var option in new Option[] { vary, design, shard, output, force, resume })
            command.Options.Add(option);
        contrastOptions.AddTo(command);

        command.SetAction(parsed =>
        {
            var timeGrid = grid.Read(parsed);
            var thresholds = contrastOptions.Thresholds(parsed);
            var baseModel = ModelArgument.Load(parsed.GetValue(model)!);
            ModelSupport.RequireSimulation(baseModel.Network);
            ModelSupport.RequireRateEquations(baseModel.Network);
            var axes = parsed.GetValue(vary)!.Select(text => ScanAxis.Parse(text, baseModel.Network)).ToArray();
            var scanDesign = ScanDesign.Parse(parsed.GetValue(design));
            var resuming = parsed.GetValue(resume);
            if (resuming && parsed.GetValue(output) is null) throw new UserInputException("--resume continues the scan in --out DIR; name the folder");
            if (resuming && !ScanSettings.IsScan(parsed.GetValue(output)!)) throw new UserInputException($"--resume: '{parsed.GetValue(output)}' holds no scan (no {ScanSettings.FileName})");
            // A resumed scan keeps its seed and its stored paths when --seed and --paths are left out (the stored values stand in,
            // as for simulate --resume), so a scan begun before paths were kept by default resumes too.
            var stored = resuming ? new StoredSettings { Seed = ScanSeed(parsed.GetValue(output)!), PathReplicates = ScanPaths(parsed.GetValue(output)!) } : null;
            var specification = ensemble.Bind(parsed, baseModel, timeGrid, stored, "scan");
            var points = scanDesign.Points(axes, specification.Seed);
            var pointShard = ReadShard(parsed.GetValue(shard), points.Count);
            var (histogramTimes, heatmap) = contrastOptions.Figures(parsed, baseModel.Network, timeGrid.Until);
            using var claim = resuming
                ? FolderClaim.Take(parsed.GetValue(output)!, "scan --resume", takeOverStale: true, takeOver: false)
                : OutputFolder.Claim(parsed.GetValue(output), baseModel.Network.Name + "-scan", DateTimeOffset.Now, parsed.GetValue(force), takeOver: false, "scan");
            var root = resuming ? Path.GetFullPath(parsed.GetValue(output)!) : claim.Folder;
            var request = new ScanRequest(baseModel, axes, scanDesign, specification, thresholds, root) { Shard = pointShard, Resume = resuming };
            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;
            error.WriteLine($"scanning {baseModel.Network.Name}: {request.ShardPoints.Count} of {points.Count} points ({scanDesign}{(pointShard.IsWhole ? "" : $", shard {pointShard}")}), " +
                $"{specification.Replicates} replicates each, seed {specification.Seed} at every point; verdicts at α = {Numbers.Format(thresholds.FalseAlarmRate)} over the map ({Numbers.Format(thresholds.FalseAlarmRate / points.Count, 3)} per point) -> {Paths.Shown(root)}");
            var (outcome, stopped) = RunPoints(session, request, histogramTimes, heatmap, error, "scan", "points");
            if (stopped is { } code)
            {
                error.WriteLine($"continue with the same command and --out {Paths.Shown(root)} --resume");
                return code;
            }
            if (pointShard.IsWhole)
                WriteReport(root, baseModel.Network.Name, axes, outcome.Cells, thresholds, points.Count);
            writer.Write(Render(axes, outcome.Cells));
            if (outcome.PointsKept > 0) writer.WriteLine($"{outcome.PointsKept} point{(outcome.PointsKept == 1 ? "" : "s")} kept from the earlier run, {outcome.PointsRun} run");
            writer.WriteLine(pointShard.IsWhole ? $"wrote {Paths.Shown(root)}" : $"wrote shard {pointShard} to {Paths.Shown(root)}; combine the shards with 'copynumber merge'");
            return ExitCodes.Done;
        });
        return command;
    }

    /// <summary>
    /// Runs the scan's points with a line per point and a progress display per ensemble; the exit code when it stopped
    /// early (1 a point failed, 130 interrupted, 0 a wall-clock limit), null when every point finished.
    /// </summary>
    internal static (ScanOutcome Outcome, int? Stopped) RunPoints(CliSession session, ScanRequest request, IReadOnlyList<double> histogramTimes, string? heatmap,
        TextWriter error, string what, string parts)
    {
        var terminal = !Console.IsErrorRedirected && error == Console.Error;
        var observer = new ScanObserver
        {
            Line = line => error.WriteLine(line),
            Ensemble = replicates =>
            {
                var monitor = new EnsembleMonitor();
                return (monitor, new ProgressDisplay(monitor, replicates, error, terminal));
            },
        };
        ScanOutcome outcome;
        using (session.Honour())
            outcome = ScanRunner.Execute(request, (folder, perPoint) => ContrastOutputs.Write(folder, perPoint, histogramTimes, heatmap).Contrast, observer, session.Interrupt);
        if (outcome.StopReason == StopReason.Finished) return (outcome, null);
        error.WriteLine(outcome.Failure is { } failure ? $"error: {failure}" : $"the {what} stopped ({outcome.StopReason.Name()})");
        error.WriteLine($"the {parts} finished so far are in {Paths.Shown(request.Folder)}");
        return (outcome, outcome.StopReason switch { StopReason.Failed => ExitCodes.RunFailed, StopReason.Interrupted => ExitCodes.Interrupted, _ => ExitCodes.Done });
    }

    /// <summary><c>copynumber merge</c> on the shards of a scan: one scan folder with every point, its table and report.</summary>
    internal static int Merge(IReadOnlyList<string> inputs, string output, bool force, ContrastThresholds thresholds, TextWriter writer)
    {
        using var claim = OutputFolder.Claim(output, "scan", DateTimeOffset.Now, force, takeOver: false, "merge");
        var merged = ScanMerge.Execute(inputs, claim.Folder, thresholds);
        WriteReport(claim.Folder, merged.Model.Network.Name, merged.Axes, merged.Cells, thresholds, merged.Points);
        writer.Write(Render(merged.Axes, merged.Cells));
        writer.WriteLine($"merged {inputs.Count} scan folder{(inputs.Count == 1 ? "" : "s")}: {merged.Points} points; wrote {Paths.Shown(claim.Folder)}");
        return ExitCodes.Done;
    }

    /// <summary>The map's report (report.md, report.html and figures) in the scan folder.</summary>
    internal static void WriteReport(string root, string name, IReadOnlyList<ScanAxis> axes, IReadOnlyList<ScanCell> cells, ContrastThresholds thresholds, int points)
    {
        var report = ScanReport.Build(name, axes.Select(a => (a.Name, a.Range?.Logarithmic ?? false)).ToArray(), cells, thresholds, points);
        ReportWriter.WriteMarkdown(report, root, "report.md");
        ReportWriter.WriteHtml(report, Path.Combine(root, "report.html"));
    }

    /// <summary>The console table: one line per point and quantity.</summary>
    internal static string Render(IReadOnlyList<ScanAxis> axes, IReadOnlyList<ScanCell> cells)
    {
        var headers = new List<string> { "point" };
        headers.AddRange(axes.Select(a => a.Name));
        headers.AddRange(["quantity", "final rel. dev.", "cv", "modes", "P(0)", "stable states", "verdicts"]);
        var table = new TextTable([.. headers]);
        foreach (var c in cells)
        {
            var row = new List<string> { c.Point.ToString(System.Globalization.CultureInfo.InvariantCulture) };
            row.AddRange(c.Values.Select(v => Numbers.Format(v)));
            row.AddRange([c.Quantity,
                double.IsNaN(c.FinalRelativeDeviation) ? "-" : $"{Numbers.Format(c.FinalRelativeDeviation, 3)} ± {Numbers.Format(c.FinalRelativeDeviationError, 2)}",
                double.IsNaN(c.CoefficientOfVariation) ? "-" : Numbers.Format(c.CoefficientOfVariation, 3),
                c.Modes.ToString(System.Globalization.CultureInfo.InvariantCulture),
                double.IsNaN(c.ZeroFraction) ? "-" : Numbers.Format(c.ZeroFraction, 3),
                c.StableSteadyStates.ToString(System.Globalization.CultureInfo.InvariantCulture),
                c.Verdicts]);
            table.Add([.. row]);
        }
        return table.ToString();
    }

    private static long? ScanPaths(string folder) => ScanSettings.Read(folder).PathReplicates;

    private static ulong ScanSeed(string folder) =>
        ulong.Parse(ScanSettings.Read(folder).Shared["seed"], System.Globalization.NumberStyles.None, System.Globalization.CultureInfo.InvariantCulture);

    private static Shard ReadShard(string? text, int points)
    {
        if (text is null) return Shard.Whole;
        if (!Shard.TryParse(text, out var parsed, out var problem)) throw new UserInputException($"--shard: {problem}");
        if (parsed.Count > points) throw new UserInputException($"--shard {parsed}: the scan has {points} point{(points == 1 ? "" : "s")}, so at most {points} shards");
        return parsed;
    }
}
