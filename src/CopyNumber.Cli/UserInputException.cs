namespace CopyNumber.Cli;

/// <summary>A bad argument found after parsing (e.g. a spacing larger than the final time); exit code 2.</summary>
internal sealed class UserInputException(string message) : CopyNumberException(message, ErrorKind.BadInput);
