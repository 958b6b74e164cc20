namespace CopyNumber.Ensembles;

/// <summary>
/// A replicate could not go on (a rate law went negative, a count overflowed, …), so the ensemble
/// stopped. The message names the replicate and says what happened; <see cref="Partial"/> holds the
/// blocks finished before the failure, so their summaries can still be written. Replicate streams are
/// fixed by the seed, so running the same replicate again fails the same way.
/// </summary>
public sealed class EnsembleFailureException : CopyNumberException
{
    /// <summary>Creates the exception; <paramref name="cause"/> is the simulator's own error.</summary>
    public EnsembleFailureException(long replicate, Exception cause, EnsembleResult partial)
        : base($"replicate {replicate} failed: {cause.Message}", ErrorKind.RunFailed, cause)
    {
        Replicate = replicate;
        Partial = partial;
    }

    /// <summary>The failed replicate's index (its stream is (seed, index)).</summary>
    public long Replicate { get; }

    /// <summary>What was finished before the failure: whole blocks only, none containing the failed replicate.</summary>
    public EnsembleResult Partial { get; }
}
