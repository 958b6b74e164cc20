using System.CommandLine;
using CopyNumber.Reports;
using CopyNumber.Cli.Rendering;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber contrast DIR</c>: where the rate equations stop describing the ensemble of a run.</summary>
internal static class ContrastCommand
{
    public static Command Create()
    {
        var folder = new Argument<string>("folder") { Description = "A folder written by 'copynumber simulate'." };
        var options = new ContrastOptions();
        var command = new Command("contrast", "Set a simulate run against its rate equations, linear noise approximation and corrected mean; write contrast.parquet, report.md and report.html.");
        command.Arguments.Add(folder);
        options.AddTo(command);
        var takeOver = TakeOverOption.Create();
        command.Options.Add(takeOver);
        command.SetAction(parsed =>
        {
            var thresholds = options.Thresholds(parsed);
            var times = options.Times(parsed);
            var dir = parsed.GetValue(folder)!;
            if (!Directory.Exists(dir)) throw new UserInputException($"'{Paths.Shown(dir)}' is not a folder written by simulate");
            if (!File.Exists(Path.Combine(dir, Storage.RunFiles.Manifest)))
                throw new UserInputException($"'{Paths.Shown(dir)}' has no {Storage.RunFiles.Manifest}: it is not a folder written by simulate");
            // The species are read only when an option names some, since reading the folder is not free.
            IReadOnlyList<string> Species() => Network.ModelLoader.LoadText(Storage.RunFolder.Read(dir).ModelText, "model").Model?.Network.Species ?? [];
            (string, string)? pair = parsed.GetValue(options.Pair) is null ? null : options.PairOf(parsed, Species());
            var reporters = parsed.GetValue(options.DualReporters) is null ? [] : options.DualReportersOf(parsed, Species());
            var (contrast, files) = ContrastOutputs.Write(dir, thresholds, times, parsed.GetValue(options.Heatmap), parsed.GetValue(takeOver), pair, reporters);
            foreach (var warning in contrast.Run.Warnings) parsed.InvocationConfiguration.Error.WriteLine($"warning: {warning}");
            var writer = parsed.InvocationConfiguration.Output;
            writer.Write(ContrastOptions.RenderVerdicts(contrast));
            writer.WriteLine($"wrote {Paths.Shown(files)}");
            return ExitCodes.Done;
        });
        return command;
    }
}
