namespace CopyNumber.Ensembles;

/// <summary>
/// The raw recordings of one block of replicates, staged before they reach the histograms so that a
/// block interrupted half-way can be dropped whole. Layout: replicate slot s, grid point k, quantity q
/// at [(s·G + k)·Q + q]; count quantities (species first) and real readouts in separate arrays.
/// </summary>
internal sealed class ReplicateBlock
{
    public ReplicateBlock(int blockSize, int gridPoints, int countQuantities, int realQuantities)
    {
        GridPoints = gridPoints;
        CountStride = countQuantities;
        RealStride = realQuantities;
        Counts = new long[(long)blockSize * gridPoints * countQuantities];
        Reals = new double[(long)blockSize * gridPoints * realQuantities];
        RecordedPoints = new int[blockSize];
    }

    public int GridPoints { get; }
    public int CountStride { get; }
    public int RealStride { get; }
    public long[] Counts { get; }
    public double[] Reals { get; }
    public int[] RecordedPoints { get; }

    /// <summary>Block index in the run.</summary>
    public long Index { get; set; }

    /// <summary>First replicate of the block.</summary>
    public long FirstReplicate { get; set; }

    /// <summary>Replicates in this block (the last block may be short).</summary>
    public int Length { get; set; }

    public ReadOnlySpan<long> CountsOf(int slot) =>
        Counts.AsSpan((int)((long)slot * GridPoints * CountStride), GridPoints * CountStride);
}
