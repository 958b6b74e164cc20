namespace CopyNumber.Analysis;

/// <summary>
/// Input the analysis cannot use (mismatched lengths, negative counts, a network the expansion cannot
/// treat). The message is written for the person who ran the command.
/// </summary>
public sealed class AnalysisInputException : CopyNumberException
{
    /// <summary>Creates the exception with a user-facing message.</summary>
    public AnalysisInputException(string message) : base(message, ErrorKind.BadInput) { }
}
