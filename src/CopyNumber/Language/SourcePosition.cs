namespace CopyNumber.Language;

/// <summary>A place in a model file: 1-based line and column, and the length of the marked text.</summary>
public readonly record struct SourcePosition(int Line, int Column, int Length = 1)
{
    /// <inheritdoc />
    public override string ToString() => $"{Line}:{Column}";
}
