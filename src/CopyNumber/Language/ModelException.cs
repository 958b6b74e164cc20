namespace CopyNumber.Language;

/// <summary>
/// A mistake in a model found while compiling it, such as a name the compiler cannot resolve. The
/// network compiler turns it into a <see cref="Diagnostic"/>; callers of the expression compiler
/// directly may catch it and show <see cref="Exception.Message"/> to the user.
/// </summary>
public sealed class ModelException : CopyNumberException
{
    /// <summary>Creates the exception.</summary>
    /// <param name="position">Where in the model the mistake is.</param>
    /// <param name="message">What is wrong, in one sentence without a trailing full stop.</param>
    public ModelException(SourcePosition position, string message) : base(message, ErrorKind.BadInput) => Position = position;

    /// <summary>Where in the model the mistake is.</summary>
    public SourcePosition Position { get; }
}
