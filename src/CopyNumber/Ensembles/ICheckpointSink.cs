namespace CopyNumber.Ensembles;

/// <summary>
/// Receives consistent snapshots of a running ensemble so that a caller can store them (checkpoints):
/// a snapshot holds exactly the blocks finished when it was taken, in the same summaries the final
/// result is built from, and the path sink has then received the paths of exactly those blocks. The
/// engine decides where a snapshot is taken (between blocks, with every worker held); the sink decides
/// when (<see cref="IsDue"/>) and where it goes.
/// </summary>
public interface ICheckpointSink
{
    /// <summary>Whether a snapshot is wanted now. Polled by a worker after each block it finishes, so it must be cheap.</summary>
    bool IsDue { get; }

    /// <summary>
    /// Called while every worker is held, just after the snapshot was taken: the path sink has received
    /// the paths of the snapshot's blocks and nothing more. A sink that stores paths in parts closes the
    /// current part here. Keep it short (no file writing): every worker waits for it.
    /// </summary>
    void Seal();

    /// <summary>Stores <paramref name="snapshot"/>; called on the worker thread that took it, once the other workers run again.</summary>
    void Save(EnsembleResult snapshot);
}
