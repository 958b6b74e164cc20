using System.Reflection;
using System.Text.RegularExpressions;

namespace CopyNumber.Tests.Architecture;

/// <summary>
/// The layering rules of DEVELOPERS.md, checked on the built assemblies and the sources (common practice:
/// architecture rules that are not checked decay). The engine carries no storage dependency, errors for
/// users come from one family, and no two namespaces depend on each other.
/// </summary>
public sealed partial class LayeringTests
{
    private static readonly Assembly Engine = typeof(CopyNumber.Network.ReactionNetwork).Assembly;
    private static readonly Assembly[] Ours =
    [
        Engine,
        typeof(CopyNumber.Storage.RunFiles).Assembly,
        typeof(CopyNumber.Runs.SimulationRun).Assembly,
        typeof(CopyNumber.Reports.ReportWriter).Assembly,
        typeof(CopyNumber.Cli.ExitCodes).Assembly,
    ];

    [Fact]
    public void TheEngineReferencesNoStorageOrPlottingLibrary()
    {
        var referenced = Engine.GetReferencedAssemblies().Select(a => a.Name ?? "").ToList();
        Assert.DoesNotContain(referenced, name => name.StartsWith("Parquet", StringComparison.OrdinalIgnoreCase));
        Assert.DoesNotContain(referenced, name => name.StartsWith("ScottPlot", StringComparison.OrdinalIgnoreCase));
        Assert.DoesNotContain(referenced, name => name.StartsWith("CopyNumber.Storage", StringComparison.Ordinal));
        Assert.DoesNotContain(referenced, name => name.StartsWith("System.CommandLine", StringComparison.Ordinal));
    }

    [Fact]
    public void EveryErrorTypeOfOursBelongsToTheOneFamily()
    {
        // The only exception outside the family is the engine's internal signal that abandons a replicate on
        // cancellation; it never leaves the ensemble runner.
        var outside = Ours.SelectMany(a => a.GetTypes())
            .Where(t => typeof(Exception).IsAssignableFrom(t) && !typeof(CopyNumberException).IsAssignableFrom(t))
            .Select(t => t.FullName)
            .Where(name => name != "CopyNumber.Ensembles.ReplicateAbandoned")
            .ToList();
        Assert.Empty(outside);
    }

    [Fact]
    public void NoTwoNamespacesDependOnEachOther()
    {
        var dependsOn = new Dictionary<string, HashSet<string>>();
        foreach (var file in Directory.EnumerateFiles(Path.Combine(RepositoryRoot(), "src"), "*.cs", SearchOption.AllDirectories))
        {
            if (file.Contains($"{Path.DirectorySeparatorChar}obj{Path.DirectorySeparatorChar}") || file.Contains($"{Path.DirectorySeparatorChar}bin{Path.DirectorySeparatorChar}")) continue;
            var text = File.ReadAllText(file);
            if (NamespaceLine().Match(text) is not { Success: true } ns) continue;
            var own = ns.Groups[1].Value;
            if (!dependsOn.TryGetValue(own, out var set)) dependsOn[own] = set = [];
            foreach (Match use in UsingLine().Matches(text))
                if (use.Groups[1].Value != own) set.Add(use.Groups[1].Value);
        }
        var cycles = dependsOn.SelectMany(p => p.Value.Where(other => dependsOn.TryGetValue(other, out var back) && back.Contains(p.Key))
            .Select(other => string.CompareOrdinal(p.Key, other) < 0 ? $"{p.Key} <-> {other}" : $"{other} <-> {p.Key}")).Distinct().ToList();
        Assert.True(dependsOn.Count > 10, "the sources were not found");
        Assert.Empty(cycles);
    }

    private static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "CopyNumber.sln"))) return dir.FullName;
        throw new InvalidOperationException("the repository root (CopyNumber.sln) was not found above the test binaries");
    }

    [GeneratedRegex(@"^namespace (CopyNumber[\w.]*);", RegexOptions.Multiline)]
    private static partial Regex NamespaceLine();

    [GeneratedRegex(@"^using (CopyNumber[\w.]*);", RegexOptions.Multiline)]
    private static partial Regex UsingLine();
}
