using System.Globalization;

namespace CopyNumber.Ensembles;

/// <summary>
/// One part of a run that is split over several processes or machines: shard <see cref="Number"/> of
/// <see cref="Count"/>, 1-based, written "i/n". The run's B blocks of replicates are cut into n
/// contiguous ranges of ⌊B/n⌋ or ⌈B/n⌉ blocks; shard i runs blocks ⌊(i − 1)·B/n⌋ … ⌊i·B/n⌋ − 1.
/// Replicate r keeps its stream (seed, r), so the shards together run exactly the replicates of the
/// unsplit run. Contiguous ranges (rather than every n-th block) keep a shard's stored moment state a
/// handful of <see cref="MomentTree"/> nodes instead of one per block.
/// </summary>
/// <param name="Number">i, from 1 to <paramref name="Count"/>.</param>
/// <param name="Count">n ≥ 1.</param>
public readonly record struct Shard(int Number, int Count)
{
    /// <summary>The whole run, "1/1".</summary>
    public static Shard Whole => new(1, 1);

    /// <summary>True for "1/1".</summary>
    public bool IsWhole => Number == 1 && Count == 1;

    /// <summary>True when 1 ≤ i ≤ n.</summary>
    public bool IsValid => Count >= 1 && Number >= 1 && Number <= Count;

    /// <summary>The blocks [First, End) this shard runs out of <paramref name="totalBlocks"/>.</summary>
    public (long First, long End) Blocks(long totalBlocks) =>
        ((long)((Int128)totalBlocks * (Number - 1) / Count), (long)((Int128)totalBlocks * Number / Count));

    /// <summary>"i/n".</summary>
    public override string ToString() => $"{Number.ToString(CultureInfo.InvariantCulture)}/{Count.ToString(CultureInfo.InvariantCulture)}";

    /// <summary>Reads "i/n"; on failure <paramref name="problem"/> says why, in words for the user.</summary>
    public static bool TryParse(string? text, out Shard shard, out string problem)
    {
        shard = Whole;
        problem = "";
        var parts = (text ?? "").Split('/');
        if (parts.Length != 2
            || !int.TryParse(parts[0], NumberStyles.None, CultureInfo.InvariantCulture, out var number)
            || !int.TryParse(parts[1], NumberStyles.None, CultureInfo.InvariantCulture, out var count))
        {
            problem = $"a shard is written i/n with whole numbers, e.g. 2/8 (got '{text}')";
            return false;
        }
        if (count < 1 || number < 1 || number > count)
        {
            problem = $"shard {number}/{count} does not exist: i must lie between 1 and n, and n must be at least 1";
            return false;
        }
        shard = new Shard(number, count);
        return true;
    }
}
