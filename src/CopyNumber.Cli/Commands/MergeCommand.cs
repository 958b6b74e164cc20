using CopyNumber.Runs;
using System.CommandLine;
using CopyNumber.Storage;
using CopyNumber.Cli.Rendering;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber merge DIR... --out DIR</c>: combine the shards of one run into one run folder.</summary>
internal static class MergeCommand
{
    public static Command Create()
    {
        var folders = new Argument<string[]>("folders") { Description = "Run folders of the same run (shards, or an earlier merge and the shards it lacked).", Arity = ArgumentArity.OneOrMore };
        var output = new Option<string>("--out") { Description = "The folder to write the merged run into (new or empty).", Required = true };
        var force = new Option<bool>("--force") { Description = "Replace the run in an existing, non-empty output folder: its files are removed first (a folder holding files copynumber did not write is refused)." };
        var takeOver = TakeOverOption.Create();
        var command = new Command("merge", "Combine the shards of a run into one folder with the same files and results as one run of all the replicates.");
        command.Arguments.Add(folders);
        command.Options.Add(output);
        command.Options.Add(force);
        command.Options.Add(takeOver);
        var noContrast = new Option<bool>("--no-contrast") { Description = "Skip the contrast with the rate equations for a complete merge." };
        var contrastOptions = new ContrastOptions();
        command.Options.Add(noContrast);
        contrastOptions.AddTo(command);
        command.SetAction(parsed =>
        {
            var inputs = parsed.GetValue(folders)!;
            var thresholds = contrastOptions.Thresholds(parsed);
            // The shards of a scan (issue 14) merge point by point.
            if (Runs.Scans.ScanSettings.IsScan(inputs[0]))
                return ScanCommand.Merge(inputs, parsed.GetValue(output)!, parsed.GetValue(force), thresholds, parsed.InvocationConfiguration.Output);
            var histogramTimes = contrastOptions.Times(parsed);
            var outcome = RunMerge.Execute(inputs, parsed.GetValue(output)!, parsed.GetValue(force), parsed.GetValue(takeOver));
            var result = outcome.Ensemble;
            foreach (var warning in outcome.Warnings) parsed.InvocationConfiguration.Error.WriteLine($"warning: {warning}");
            var folder = Path.GetDirectoryName(outcome.Files[^1])!;
            parsed.InvocationConfiguration.Output.WriteLine(
                $"merged {inputs.Length} folder{(inputs.Length == 1 ? "" : "s")}: {result.ReplicatesFinished} of {result.ReplicatesRequested} replicates, {result.EventsFired} events; wrote {Paths.Shown(folder)}");
            if (result.Interrupted)
                parsed.InvocationConfiguration.Error.WriteLine(
                    $"warning: blocks are missing ({result.FinishedBlocks.Count} of {result.TotalBlocks} finished); the merged summaries are marked partial. Merge the missing shards in later, or continue with 'copynumber simulate ... --resume {Paths.Shown(folder)}'");
            else if (!parsed.GetValue(noContrast))
            {
                // A complete merge is a whole run, so it gets the same contrast and report a whole run gets.
                var (contrast, files) = Reports.ContrastOutputs.Write(folder, thresholds, histogramTimes, parsed.GetValue(contrastOptions.Heatmap));
                parsed.InvocationConfiguration.Output.Write(ContrastOptions.RenderVerdicts(contrast));
                parsed.InvocationConfiguration.Output.WriteLine($"wrote {Paths.Shown(files)}");
            }
            return ExitCodes.Done;
        });
        return command;
    }
}
