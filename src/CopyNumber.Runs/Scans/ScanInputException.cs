namespace CopyNumber.Runs.Scans;

/// <summary>A scan asked for in a way that cannot be carried out (a SPEC that does not read, a name the model lacks); the input is at fault.</summary>
public sealed class ScanInputException(string message) : CopyNumberException(message, ErrorKind.BadInput);
