using System.Diagnostics;
using CopyNumber.Cli;

namespace CopyNumber.Tests.Resilience;

/// <summary>The built copynumber.dll run as a real child process, and POSIX signals sent to it with /bin/kill.</summary>
internal static class ChildProcess
{
    /// <summary>Exit status the dotnet host reports for a child ended by SIGKILL (128 + 9, common practice for POSIX shells and .NET).</summary>
    public const int KilledBySigkill = 137;

    /// <summary>Starts the binary (copied beside the tests by the project reference) under the dotnet host, with extra environment variables.</summary>
    public static Process Start(IEnumerable<string> arguments, IReadOnlyDictionary<string, string>? environment = null)
    {
        var binary = typeof(CliApplication).Assembly.Location;
        var host = Environment.ProcessPath is { } path && Path.GetFileNameWithoutExtension(path) == "dotnet" ? path : "dotnet";
        var info = new ProcessStartInfo(DefaultSignals.Value ? "/usr/bin/env" : host)
        {
            RedirectStandardError = true,
            RedirectStandardOutput = true,
            UseShellExecute = false,
        };
        if (DefaultSignals.Value)
        {
            info.ArgumentList.Add("--default-signal=HUP,INT,QUIT,TERM");
            info.ArgumentList.Add(host);
        }
        info.ArgumentList.Add(binary);
        foreach (var a in arguments) info.ArgumentList.Add(a);
        foreach (var (key, value) in environment ?? new Dictionary<string, string>()) info.Environment[key] = value;
        return Process.Start(info) ?? throw new InvalidOperationException("could not start the child process");
    }

    /// <summary>
    /// Whether the child can be started with the default handling of the stop signals. An ignored signal is inherited
    /// across exec, and a test host started as a background job of a non-interactive shell ignores SIGINT and SIGQUIT
    /// (POSIX, common practice); the .NET runtime then leaves them ignored in the child, as it should for a real
    /// background job, and the signal tests would test the shell instead of the program. coreutils' env
    /// (8.31 and later) resets them; it execs the host, so the child's process id is still the program's.
    /// </summary>
    private static readonly Lazy<bool> DefaultSignals = new(() =>
    {
        if (!OperatingSystem.IsLinux() || !File.Exists("/usr/bin/env")) return false;
        try
        {
            using var probe = Process.Start(new ProcessStartInfo("/usr/bin/env", ["--default-signal=INT", "true"]) { UseShellExecute = false, RedirectStandardError = true })!;
            probe.WaitForExit();
            return probe.ExitCode == 0;
        }
        catch (System.ComponentModel.Win32Exception)
        {
            return false;
        }
    });

    /// <summary>Sends <paramref name="signal"/> (e.g. "KILL", "TERM") to <paramref name="pid"/>.</summary>
    public static void Signal(int pid, string signal)
    {
        using var kill = Process.Start(new ProcessStartInfo("/bin/kill", ["-" + signal, pid.ToString()]) { UseShellExecute = false })!;
        kill.WaitForExit();
    }
}
