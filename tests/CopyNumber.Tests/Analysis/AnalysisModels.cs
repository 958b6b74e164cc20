using CopyNumber.Deterministic;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Analysis;

/// <summary>Compiles small .cnet texts for the analysis tests and holds the solver settings they share.</summary>
internal static class AnalysisModels
{
    /// <summary>Tight tolerances, so that integration error is far below every tolerance the tests assert.</summary>
    public static SolverOptions Tight { get; } = new(SolverKind.Auto, RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-12);

    public static ReactionNetwork Compile(string text)
    {
        var parsed = ModelSource.Parse(text, "test.cnet");
        Assert.True(parsed.Succeeded, string.Join("\n", parsed.Diagnostics.Select(d => d.Format())));
        var compiled = NetworkCompiler.Compile(parsed.Model!);
        Assert.True(compiled.Network is not null, string.Join("\n", compiled.Diagnostics.Select(d => d.Format())));
        return compiled.Network!;
    }
}
