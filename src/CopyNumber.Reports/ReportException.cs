namespace CopyNumber.Reports;

/// <summary>
/// A figure or report could not be made from the data given, or could not be written. The
/// <see cref="Exception.Message"/> is written for the person running the command (it names the species,
/// figure or file at fault) and can be shown as it is, without a stack trace.
/// </summary>
public sealed class ReportException : CopyNumberException
{
    /// <summary>Creates the exception with a user-facing message.</summary>
    public ReportException(string message) : base(message, ErrorKind.RunFailed) { }

    /// <summary>Creates the exception with a user-facing message and the lower-level cause.</summary>
    public ReportException(string message, Exception inner) : base(message, ErrorKind.RunFailed, inner) { }
}
