using System.CommandLine;
using CopyNumber.Network;

namespace CopyNumber.Cli.Commands;

/// <summary>The MODEL argument every command takes, and loading it with diagnostics sent to the printer.</summary>
internal static class ModelArgument
{
    public static Argument<string> Create() => new("model") { Description = "The network file (.cnet)." };

    public static LoadedModel Load(string path, CompileOptions? options = null)
    {
        var outcome = ModelLoader.Load(path, options);
        if (outcome.Model is null) throw new ModelInputException(outcome.Diagnostics);
        return outcome.Model;
    }
}
