using System.Diagnostics;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// A test that needs headless Chromium (Debian's package 'chromium'). Without it the test is reported as skipped, with
/// the reason, rather than passing silently; when <see cref="RequiredVariable"/> is set (CI's .ci/run sets it after
/// installing the browser) the test always runs, so a missing browser fails it.
/// </summary>
public sealed class BrowserFactAttribute : FactAttribute
{
    /// <summary>Set to 1 to make browser tests mandatory.</summary>
    public const string RequiredVariable = "COPYNUMBER_BROWSER_TESTS";

    public BrowserFactAttribute()
    {
        if (Browser.Path is null && Environment.GetEnvironmentVariable(RequiredVariable) != "1")
            Skip = $"no chromium on PATH (apt-get install chromium; .ci/run installs it and sets {RequiredVariable}=1)";
    }
}

/// <summary>Headless Chromium, run as a child process with a time limit.</summary>
internal static class Browser
{
    /// <summary>The browser's executable, or null when none is installed.</summary>
    public static string? Path { get; } = new[] { "chromium", "chromium-browser" }
        .SelectMany(name => (Environment.GetEnvironmentVariable("PATH") ?? "").Split(':').Select(dir => System.IO.Path.Combine(dir, name)))
        .FirstOrDefault(File.Exists);

    /// <summary>Runs the browser headless on <paramref name="arguments"/> and returns what it printed on standard output.</summary>
    public static string Run(params string[] arguments)
    {
        var executable = Path ?? throw new InvalidOperationException($"chromium is not installed, and {BrowserFactAttribute.RequiredVariable}=1 requires it");
        var profile = Directory.CreateTempSubdirectory("copynumber-chromium-");
        try
        {
            var start = new ProcessStartInfo(executable)
            {
                RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false,
            };
            foreach (var a in new[] { "--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--hide-scrollbars", $"--user-data-dir={profile.FullName}" })
                start.ArgumentList.Add(a);
            foreach (var a in arguments) start.ArgumentList.Add(a);
            using var process = Process.Start(start)!;
            var output = process.StandardOutput.ReadToEndAsync();
            var error = process.StandardError.ReadToEndAsync();
            // A generous limit for a loaded 2-core machine; it only guards against a hung browser.
            if (!process.WaitForExit(TimeSpan.FromMinutes(2)))
            {
                process.Kill(entireProcessTree: true);
                throw new TimeoutException("chromium did not finish within 2 minutes");
            }
            return output.Result + (process.ExitCode == 0 ? "" : $"\n[chromium exit {process.ExitCode}] {error.Result}");
        }
        finally
        {
            try { profile.Delete(recursive: true); } catch (IOException) { } // the browser may still be releasing files
        }
    }
}
