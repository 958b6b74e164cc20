using System.Globalization;
using CopyNumber.Language;

namespace CopyNumber.Tests.Language;

/// <summary>Helpers shared by the language tests.</summary>
internal static class LanguageTestSupport
{
    /// <summary>Parses a model that must be free of mistakes and returns it.</summary>
    public static ModelSyntax ParseValid(string text)
    {
        var outcome = ModelSource.Parse(text, "test.cnet");
        Assert.True(outcome.Succeeded, string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        return outcome.Model!;
    }

    /// <summary>Parses a model with exactly one mistake and checks where it is and what the message says.</summary>
    public static Diagnostic AssertSingleError(string text, int line, int column, params string[] words)
    {
        var outcome = ModelSource.Parse(text, "test.cnet");
        Assert.Null(outcome.Model);
        Assert.False(outcome.Succeeded);
        var diagnostic = Assert.Single(outcome.Diagnostics);
        AssertDiagnostic(diagnostic, line, column, words);
        return diagnostic;
    }

    /// <summary>Checks a diagnostic's place and that its message holds every one of <paramref name="words"/>.</summary>
    public static void AssertDiagnostic(Diagnostic diagnostic, int line, int column, params string[] words)
    {
        Assert.True((line, column) == (diagnostic.Position.Line, diagnostic.Position.Column),
            $"expected {line}:{column}, got {diagnostic.Position}: {diagnostic.Message}");
        foreach (var word in words)
            Assert.True(diagnostic.Message.Contains(word, StringComparison.Ordinal), $"'{word}' missing from: {diagnostic.Message}");
    }

    /// <summary>A fully parenthesised rendering, so a test can state the intended grouping of an expression.</summary>
    public static string Show(Expr expr) => expr switch
    {
        NumberExpr n => n.Value.ToString(CultureInfo.InvariantCulture),
        NameExpr n => n.Name,
        NegateExpr n => $"(-{Show(n.Operand)})",
        BinaryExpr b => $"({Show(b.Left)} {b.Operator} {Show(b.Right)})",
        CallExpr c => $"{c.Function}({string.Join(", ", c.Arguments.Select(Show))})",
        _ => throw new ArgumentException("unknown expression node"),
    };

    /// <summary>The repository's scenarios folder, found by walking up from the test binaries.</summary>
    public static string ScenariosFolder()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            var candidate = Path.Combine(dir.FullName, "scenarios");
            if (Directory.Exists(candidate) && File.Exists(Path.Combine(dir.FullName, "CopyNumber.sln"))) return candidate;
        }
        throw new DirectoryNotFoundException("scenarios folder not found above " + AppContext.BaseDirectory);
    }

    /// <summary>Every bundled scenario, by file name.</summary>
    public static IReadOnlyList<string> ScenarioFiles() =>
        Directory.GetFiles(ScenariosFolder(), "*.cnet").OrderBy(f => f, StringComparer.Ordinal).ToArray();
}
