using System.Diagnostics;
using CopyNumber.Cli;

namespace CopyNumber.Tests.Resilience;

/// <summary>The built copynumber.dll run as a real child process, optionally inside a private mount namespace with a small tmpfs.</summary>
internal static class ChildCli
{
    /// <summary>Liveness limit so a broken build cannot hang the suite; not a measurement.</summary>
    public static readonly TimeSpan Patience = TimeSpan.FromSeconds(120);

    /// <summary>The dotnet host running the tests (or "dotnet" from PATH).</summary>
    public static string Host => Environment.ProcessPath is { } host && Path.GetFileNameWithoutExtension(host) == "dotnet" ? host : "dotnet";

    /// <summary>The command binary copied beside the tests by the project reference.</summary>
    public static string Binary => typeof(CliApplication).Assembly.Location;

    /// <summary>Starts <c>copynumber <paramref name="arguments"/></c> with both streams redirected.</summary>
    public static Process Start(IEnumerable<string> arguments) => ChildProcess.Start(arguments);

    /// <summary>Runs a process to its end; its exit code and both streams.</summary>
    public static (int ExitCode, string Output, string Error) Finish(Process child)
    {
        var output = child.StandardOutput.ReadToEndAsync();
        var error = child.StandardError.ReadToEndAsync();
        if (!child.WaitForExit(Patience))
        {
            child.Kill(entireProcessTree: true);
            Assert.Fail("the child did not finish");
        }
        child.WaitForExit();
        return (child.ExitCode, output.Result, error.Result);
    }

    /// <summary>
    /// Why a real tmpfs cannot be mounted here, or null when it can: the test mounts one in a private user
    /// and mount namespace (<c>unshare --user --map-root-user --mount</c>), which needs no root but does need
    /// unprivileged user namespaces (Linux only; some kernels and containers forbid them).
    /// </summary>
    public static string? TmpfsUnavailable()
    {
        if (!OperatingSystem.IsLinux()) return "tmpfs in a user namespace is Linux only";
        if (!File.Exists("/usr/bin/unshare") && !File.Exists("/bin/unshare")) return "no unshare(1) on this machine";
        var probe = Path.Combine(Path.GetTempPath(), "copynumber-tmpfs-probe-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(probe);
        try
        {
            var (code, _, error) = Shell($"mount -t tmpfs -o size=64k tmpfs '{probe}' && test -w '{probe}'");
            return code == 0 ? null : $"unshare/mount refused: {error.Trim()}";
        }
        finally
        {
            Directory.Delete(probe);
        }
    }

    /// <summary>The shell words that run copynumber inside <see cref="Shell"/>.</summary>
    public const string Cn = "\"$CN_HOST\" \"$CN_DLL\"";

    /// <summary>Runs <paramref name="script"/> under /bin/sh inside a new user and mount namespace; <see cref="Cn"/> runs copynumber.</summary>
    public static (int ExitCode, string Output, string Error) Shell(string script)
    {
        var info = new ProcessStartInfo("unshare") { RedirectStandardError = true, RedirectStandardOutput = true, UseShellExecute = false };
        foreach (var a in new[] { "--user", "--map-root-user", "--mount", "/bin/sh", "-c", script }) info.ArgumentList.Add(a);
        info.Environment["CN_HOST"] = Host;
        info.Environment["CN_DLL"] = Binary;
        return Finish(Process.Start(info) ?? throw new InvalidOperationException("could not start unshare"));
    }
}
