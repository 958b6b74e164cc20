using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>A model read from disk: its text (for provenance), syntax tree and compiled network.</summary>
/// <param name="Path">The path as the user gave it.</param>
/// <param name="Text">The file's full text.</param>
/// <param name="Syntax">The parsed, checked model.</param>
/// <param name="Network">The compiled network.</param>
public sealed record LoadedModel(string Path, string Text, ModelSyntax Syntax, ReactionNetwork Network);

/// <summary>The result of loading a model: the model, or every diagnostic that stopped it.</summary>
public sealed record LoadOutcome(LoadedModel? Model, IReadOnlyList<Diagnostic> Diagnostics);

/// <summary>Text → syntax → compiled network in one call, for the commands that start from a file.</summary>
public static class ModelLoader
{
    /// <summary>Reads, parses, checks and compiles a model file. Never throws for bad input.</summary>
    public static LoadOutcome Load(string path, CompileOptions? options = null)
    {
        var (text, problem) = ModelSource.ReadText(path);
        if (text is null) return new LoadOutcome(null, [problem!]);
        if (!Sbml.SbmlImporter.IsSbmlPath(path)) return LoadText(text, path, options);
        // SBML is translated into the network language first; the run keeps the translation as its model text.
        var imported = Sbml.SbmlImporter.Import(text, path);
        if (!imported.Succeeded) return new LoadOutcome(null, imported.Diagnostics);
        var loaded = LoadText(imported.CnetText!, path, options);
        return loaded.Model is not null ? loaded
            : new LoadOutcome(null, loaded.Diagnostics.Select(d => d with { File = $"{path} (as imported)" }).ToList());
    }

    /// <summary>
    /// Parses, checks and compiles model text; <paramref name="file"/> names it in messages. A model too large
    /// for the memory becomes a diagnostic with its size, not an <see cref="OutOfMemoryException"/>.
    /// </summary>
    public static LoadOutcome LoadText(string text, string file, CompileOptions? options = null)
    {
        var parsed = ModelSource.Parse(text, file);
        if (parsed.Model is null || parsed.Diagnostics.Count > 0)
            return new LoadOutcome(null, parsed.Diagnostics);
        // The compiler quotes source lines in its diagnostics when it has them.
        var lines = text.Split('\n').Select(l => l.TrimEnd('\r')).ToArray();
        CompileOutcome compiled;
        try
        {
            compiled = NetworkCompiler.Compile(parsed.Model, (options ?? new CompileOptions()) with { SourceLines = lines });
        }
        catch (OutOfMemoryException)
        {
            // Compilation is linear in the model, so this is a model far beyond the machine: say so, with sizes.
            var available = GC.GetGCMemoryInfo().TotalAvailableMemoryBytes;
            var reactions = parsed.Model.Reactions.Sum(r => r.Reversible ? 2 : 1);
            return new LoadOutcome(null, [new Diagnostic(file, new SourcePosition(1, 1),
                $"the model is too large to compile in the memory available: {reactions:N0} reactions and {parsed.Model.Species.Count:N0} species " +
                $"({text.Length:N0} characters), with about {available / (double)(1L << 30):0.0} GB available", "")]);
        }
        if (compiled.Network is null || compiled.Diagnostics.Count > 0)
            return new LoadOutcome(null, compiled.Diagnostics);
        return new LoadOutcome(new LoadedModel(file, text, parsed.Model, compiled.Network), []);
    }
}
