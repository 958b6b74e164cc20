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
        var info = new ProcessStartInfo(Environment.ProcessPath is { } host && Path.GetFileNameWithoutExtension(host) == "dotnet" ? host : "dotnet")
        {
            RedirectStandardError = true,
            RedirectStandardOutput = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(binary);
        foreach (var a in arguments) info.ArgumentList.Add(a);
        foreach (var (key, value) in environment ?? new Dictionary<string, string>()) info.Environment[key] = value;
        return Process.Start(info) ?? throw new InvalidOperationException("could not start the child process");
    }

    /// <summary>Sends <paramref name="signal"/> (e.g. "KILL", "TERM") to <paramref name="pid"/>.</summary>
    public static void Signal(int pid, string signal)
    {
        using var kill = Process.Start(new ProcessStartInfo("/bin/kill", ["-" + signal, pid.ToString()]) { UseShellExecute = false })!;
        kill.WaitForExit();
    }
}
