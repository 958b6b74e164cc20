using System.Globalization;

namespace CopyNumber.Ensembles;

/// <summary>Writes and reads sets of block indices compactly as ranges, e.g. "0-41,43,45-60".</summary>
public static class BlockRanges
{
    /// <summary>The sorted indices as comma-separated ranges.</summary>
    public static string Format(IReadOnlyList<long> sorted)
    {
        var parts = new List<string>();
        for (var i = 0; i < sorted.Count;)
        {
            var start = sorted[i];
            var end = start;
            while (i + 1 < sorted.Count && sorted[i + 1] == end + 1) end = sorted[++i];
            i++;
            parts.Add(start == end ? start.ToString(CultureInfo.InvariantCulture) : $"{start}-{end}");
        }
        return string.Join(",", parts);
    }

    /// <summary>⌈<paramref name="replicates"/> / <paramref name="blockSize"/>⌉: the blocks a run of that many replicates has.</summary>
    public static long BlocksFor(long replicates, int blockSize) =>
        replicates < 1 || blockSize < 1 ? 0 : (replicates - 1) / blockSize + 1;

    /// <summary>The replicates in blocks [<paramref name="first"/>, <paramref name="end"/>) of a run of <paramref name="replicates"/> in blocks of <paramref name="blockSize"/>.</summary>
    public static long ReplicatesIn(long replicates, int blockSize, long first, long end) =>
        ReplicatesBefore(replicates, blockSize, end) - ReplicatesBefore(replicates, blockSize, first);

    /// <summary>The replicates in the blocks before <paramref name="block"/>, without overflow for any block number (a damaged manifest may name any).</summary>
    private static long ReplicatesBefore(long replicates, int blockSize, long block) =>
        block <= 0 ? 0 : block > replicates / blockSize ? replicates : Math.Min(replicates, block * blockSize);

    /// <summary>Reads what <see cref="Format"/> wrote.</summary>
    /// <exception cref="FormatException">The text is not a list of ranges.</exception>
    /// <param name="text">Ranges such as "0-13,20".</param>
    /// <param name="blockCount">The run's number of blocks: a range past it is refused before it is expanded, so an edited range cannot exhaust time or memory.</param>
    public static HashSet<long> Parse(string text, long blockCount = long.MaxValue)
    {
        var set = new HashSet<long>();
        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            var dash = part.IndexOf('-');
            var start = long.Parse(dash < 0 ? part : part[..dash], CultureInfo.InvariantCulture);
            var end = dash < 0 ? start : long.Parse(part[(dash + 1)..], CultureInfo.InvariantCulture);
            if (end < start) throw new FormatException($"range '{part}' runs backwards");
            if (start < 0 || end >= blockCount) throw new FormatException($"range '{part}' names a block outside the run's {blockCount} blocks");
            for (var b = start; b <= end; b++) set.Add(b);
        }
        return set;
    }
}
