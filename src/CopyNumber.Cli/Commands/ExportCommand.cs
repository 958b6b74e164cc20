using System.CommandLine;
using CopyNumber.Language;
using CopyNumber.Sbml;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// <c>copynumber export MODEL [--out MODEL.xml] [--force]</c>: a model written as SBML Level 3 Version 2 core,
/// printed or written. What SBML core cannot carry exactly is refused at its line (exit 2); an existing
/// output file is replaced only with --force.
/// </summary>
internal static class ExportCommand
{
    public static Command Create()
    {
        var model = ModelArgument.Create();
        var output = new Option<string?>("--out") { Description = "Write the SBML to this file instead of printing it." };
        var force = new Option<bool>("--force") { Description = "Replace the --out file when it exists." };
        var command = new Command("export", "Write a model as SBML Level 3 Version 2 core: kinetic laws are propensities in molecule counts, changes are events, readouts are assignment rules.");
        command.Arguments.Add(model);
        command.Options.Add(output);
        command.Options.Add(force);
        command.SetAction(parsed =>
        {
            var destination = parsed.GetValue(output);
            OutputFile.Check(destination, parsed.GetValue(force), "model.xml");
            var loaded = ModelArgument.Load(parsed.GetValue(model)!);
            var exported = SbmlExporter.Export(loaded);
            if (!exported.Succeeded) throw new ModelInputException(exported.Diagnostics);
            if (destination is null) parsed.InvocationConfiguration.Output.Write(exported.Xml);
            else
            {
                Storage.AtomicFile.WriteAllText(destination, exported.Xml!);
                parsed.InvocationConfiguration.Output.Write($"wrote {destination}\n");
            }
            return ExitCodes.Done;
        });
        return command;
    }
}
