namespace CopyNumber.Cli;

/// <summary>The process exit codes, documented in README.md.</summary>
internal static class ExitCodes
{
    /// <summary>The command did what was asked.</summary>
    public const int Done = 0;
    /// <summary>The input was fine but the run failed (a rate law went negative, a solver gave up, a disk filled).</summary>
    public const int RunFailed = 1;
    /// <summary>Bad arguments or a bad model file.</summary>
    public const int BadInput = 2;
    /// <summary>Stopped by Ctrl-C or SIGTERM; what was finished has been written.</summary>
    public const int Interrupted = 130;

    /// <summary>The exit code of an error of the given kind: the one mapping from errors to codes.</summary>
    public static int For(ErrorKind kind) => kind == ErrorKind.BadInput ? BadInput : RunFailed;
}
