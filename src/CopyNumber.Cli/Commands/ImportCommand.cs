using System.CommandLine;
using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Sbml;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// <c>copynumber import MODEL.xml [--out MODEL.cnet]</c>: an SBML model translated into the network language,
/// checked by compiling it, printed or written. Refusals point into the XML (exit 2).
/// </summary>
internal static class ImportCommand
{
    public static Command Create()
    {
        var model = new Argument<string>("model") { Description = "The SBML file (.xml or .sbml; Level 2 Version 4, Level 3 Version 1 or 2, core)." };
        var output = new Option<string?>("--out") { Description = "Write the translation to this .cnet file instead of printing it." };
        var perUnit = new Option<double>("--molecules-per-unit")
        {
            Description = "Molecules per unit of substance (1 reads amounts as counts; Avogadro's number times the scale for a model in moles).",
            DefaultValueFactory = _ => 1,
        };
        var command = new Command("import", "Translate an SBML model into the network language, with a header saying how each part was mapped.");
        command.Arguments.Add(model);
        command.Options.Add(output);
        command.Options.Add(perUnit);
        command.SetAction(parsed =>
        {
            var path = parsed.GetValue(model)!;
            var factor = parsed.GetValue(perUnit);
            if (!(factor > 0) || !double.IsFinite(factor)) throw new UserInputException($"--molecules-per-unit must be a positive number, found {factor}");
            var (text, problem) = ModelSource.ReadText(path);
            if (text is null) throw new ModelInputException([problem!]);
            var imported = SbmlImporter.Import(text, path, new SbmlImportOptions { MoleculesPerSubstanceUnit = factor });
            if (!imported.Succeeded) throw new ModelInputException(imported.Diagnostics);
            // The translation must compile: a refusal here is the importer's, stated against the text it wrote.
            var compiled = ModelLoader.LoadText(imported.CnetText!, $"{path} (as imported)");
            if (compiled.Model is null) throw new ModelInputException(compiled.Diagnostics);
            var destination = parsed.GetValue(output);
            if (destination is null) parsed.InvocationConfiguration.Output.Write(imported.CnetText);
            else
            {
                Storage.AtomicFile.WriteAllText(destination, imported.CnetText!);
                parsed.InvocationConfiguration.Output.Write($"wrote {destination}\n");
            }
            return ExitCodes.Done;
        });
        return command;
    }
}
