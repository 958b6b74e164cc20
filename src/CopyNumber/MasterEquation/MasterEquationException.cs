namespace CopyNumber.MasterEquation;

/// <summary>
/// The master equation of a model cannot be solved as asked: the projection would exceed its state
/// limit, the model uses a feature the solver does not handle, or a schedule change is impossible on
/// some state. The message says what and suggests what to do instead.
/// </summary>
public sealed class MasterEquationException : CopyNumberException
{
    /// <summary>Creates the exception with its user-facing message.</summary>
    public MasterEquationException(string message) : base(message, ErrorKind.BadInput) { }

    /// <summary>States the projection held when it stopped, or 0 when the failure is not about size.</summary>
    public long StatesReached { get; init; }
}
