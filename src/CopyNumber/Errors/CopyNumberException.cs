namespace CopyNumber;

/// <summary>Whose problem an error is: it decides the exit code, in one place (the CLI's command runner).</summary>
public enum ErrorKind
{
    /// <summary>The input is at fault (model, arguments, a run folder that cannot be used); nothing ran. Exit code 2.</summary>
    BadInput,

    /// <summary>The input was accepted but the run failed (a rate law went negative, a solver gave up, a disk filled). Exit code 1.</summary>
    RunFailed,
}

/// <summary>
/// The one family of errors the project raises for its users: every message is a user-facing sentence as
/// it stands, and <see cref="Kind"/> says whether the input or the run is at fault. Anything else that
/// escapes is a defect of the program.
/// </summary>
public abstract class CopyNumberException : Exception
{
    /// <summary>Creates the error.</summary>
    /// <param name="message">User-facing sentences.</param>
    /// <param name="kind">Whose problem it is.</param>
    /// <param name="inner">The underlying error, if any.</param>
    protected CopyNumberException(string message, ErrorKind kind, Exception? inner = null)
        : base(message, inner)
    {
        Kind = kind;
    }

    /// <summary>Whose problem it is.</summary>
    public ErrorKind Kind { get; }

    /// <summary>The lines to show the user, without the leading "error: " (which the caller adds); by default the message.</summary>
    public virtual IReadOnlyList<string> Lines => [Message];

    /// <summary>True when each of <see cref="Lines"/> is already a complete diagnostic (e.g. <c>file:line:col: error: …</c>) that takes no "error: " prefix.</summary>
    public virtual bool LinesArePrefixed => false;
}
