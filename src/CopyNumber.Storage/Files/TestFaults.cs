using System.Diagnostics;

namespace CopyNumber.Storage;

/// <summary>
/// TEST ONLY: a fault the resilience tests inject into a real child process, deterministically, where
/// a signal sent from outside could not be aimed. When the environment variable
/// <c>COPYNUMBER_TEST_KILL_AFTER</c> holds a full file path, the process kills itself with SIGKILL right
/// after renaming a finished file to that path (as a power loss or <c>kill -9</c> at that instant
/// would); when it holds <c>commit:N</c>, right after its N-th such rename. Unset, it costs one
/// comparison per file written. Never set it outside the tests.
/// </summary>
internal static class TestFaults
{
    /// <summary>The environment variable; documented in docs/conventions.md as test-only.</summary>
    public const string KillAfterVariable = "COPYNUMBER_TEST_KILL_AFTER";

    private static readonly string? KillAfter = Environment.GetEnvironmentVariable(KillAfterVariable);
    private static int _commits;

    /// <summary>Called after <paramref name="finalPath"/> got its final name.</summary>
    public static void Committed(string finalPath)
    {
        if (KillAfter is null) return;
        var count = Interlocked.Increment(ref _commits);
        var hit = KillAfter.StartsWith("commit:", StringComparison.Ordinal)
            ? int.TryParse(KillAfter.AsSpan(7), out var n) && n == count
            : string.Equals(KillAfter, finalPath, StringComparison.Ordinal);
        if (hit) Process.GetCurrentProcess().Kill(); // SIGKILL on Unix: no handler, no cleanup runs
    }
}
