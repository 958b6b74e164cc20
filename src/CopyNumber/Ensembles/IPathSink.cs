namespace CopyNumber.Ensembles;

/// <summary>Receives whole replicate paths, in increasing replicate order, from a single thread at a time.</summary>
public interface IPathSink
{
    /// <summary>
    /// One replicate's state at every grid point: <paramref name="counts"/>[k·<paramref name="stride"/> + i]
    /// is species i at grid point k; <paramref name="recordedPoints"/> is less than the grid size when the
    /// replicate stopped early. The memory is reused after the call returns.
    /// </summary>
    void Write(long replicate, ReadOnlySpan<long> counts, int stride, int recordedPoints);
}
