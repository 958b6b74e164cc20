using CopyNumber.Language;
using System.CommandLine;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Cli.Commands;

/// <summary>The MODEL argument every command takes, and loading it with diagnostics sent to the printer.</summary>
internal static class ModelArgument
{
    public static Argument<string> Create() => new("model") { Description = "The network file (.cnet), or an SBML model (.xml, .sbml) translated as by 'import'." };

    /// <summary>MODEL for simulate: optional, because --resume DIR reads the model text stored in the run.</summary>
    public static Argument<string?> CreateOptional() =>
        new("model") { Description = "The network file (.cnet, or SBML .xml/.sbml); with --resume it may be left out (the stored model is used).", Arity = ArgumentArity.ZeroOrOne };

    /// <summary>Loads MODEL; a model's warnings (a cell cycle's rate laws that ignore the volume) go to <paramref name="warnings"/> when given.</summary>
    public static LoadedModel Load(string path, CompileOptions? options = null, TextWriter? warnings = null)
    {
        var outcome = ModelLoader.Load(path, options);
        if (outcome.Model is null) throw new ModelInputException(outcome.Diagnostics);
        if (warnings is not null)
            foreach (var warning in outcome.Model.Network.Cycle?.Warnings ?? []) warnings.WriteLine(warning.Format("warning"));
        return outcome.Model;
    }

    /// <summary>The model a run folder was made with: its stored text (checked against the manifest's SHA-256), named by the stored file name.</summary>
    public static LoadedModel LoadStored(StoredRun stored)
    {
        var outcome = ModelLoader.LoadText(stored.ModelText(), stored.Manifest.ModelFile);
        if (outcome.Model is null) throw new ModelInputException(outcome.Diagnostics);
        return outcome.Model;
    }
}
