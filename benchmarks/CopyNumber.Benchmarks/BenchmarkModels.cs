using CopyNumber.Network;

namespace CopyNumber.Benchmarks;

/// <summary>Loads the bundled scenarios the benchmarks run on, from the repository's scenarios folder.</summary>
internal static class BenchmarkModels
{
    public static ReactionNetwork Load(string scenario)
    {
        var path = Path.Combine(FindRepositoryRoot(), "scenarios", scenario);
        var outcome = ModelLoader.Load(path);
        if (outcome.Model is null)
            throw new InvalidOperationException(string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        return outcome.Model.Network;
    }

    private static string FindRepositoryRoot()
    {
        // BenchmarkDotNet runs from a generated folder deep under bin/; walk up to the folder with the solution.
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "CopyNumber.sln"))) return dir.FullName;
        for (var dir = new DirectoryInfo(Environment.CurrentDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "CopyNumber.sln"))) return dir.FullName;
        throw new DirectoryNotFoundException("cannot find the repository root (CopyNumber.sln) above " + AppContext.BaseDirectory);
    }
}
