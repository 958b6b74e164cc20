using CopyNumber.Cli;

namespace CopyNumber.Tests.Cli;

/// <summary>Runs the real command tree in-process and captures what it prints.</summary>
internal sealed record CliRun(int ExitCode, string Output, string Error)
{
    public static CliRun Of(params string[] args)
    {
        var output = new StringWriter();
        var error = new StringWriter();
        var code = CliApplication.Run(args, output, error);
        return new CliRun(code, output.ToString(), error.ToString());
    }

    /// <summary>The repository's scenarios folder, found from the test binary's location.</summary>
    public static string Scenario(string name)
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            var candidate = Path.Combine(dir.FullName, "scenarios", name);
            if (File.Exists(candidate)) return candidate;
        }
        throw new FileNotFoundException("scenario not found above the test binary", name);
    }

    /// <summary>The bundled scenario file names, for theories over every scenario.</summary>
    public static TheoryData<string> ScenarioNames()
    {
        var data = new TheoryData<string>();
        foreach (var path in AllScenarios()) data.Add(Path.GetFileName(path));
        return data;
    }

    public static IEnumerable<string> AllScenarios()
    {
        var folder = Path.GetDirectoryName(Scenario("promoter_switch.cnet"))!;
        return Directory.EnumerateFiles(folder, "*.cnet").Order(StringComparer.Ordinal);
    }
}
