using CopyNumber.Storage;

namespace CopyNumber.Runs;

/// <summary>
/// The joint histogram of two species at every grid time, counted over the replicates whose paths the run stored
/// (paths.parquet: the first N replicates by index, so the same whatever the threads or shards). Each time's
/// fractions sum to 1 over the replicates recorded there; a bimodal pair (a toggle's two states) shows as two
/// separate groups of cells.
/// </summary>
/// <param name="First">The species on the horizontal axis.</param>
/// <param name="Second">The species on the vertical axis.</param>
/// <param name="Replicates">Replicates whose paths were counted.</param>
/// <param name="Laws">Per grid time: (first count, second count, fraction of replicates), cells with a replicate only, ascending by first then second.</param>
public sealed record PairHistogram(string First, string Second, int Replicates, IReadOnlyList<IReadOnlyList<(long First, long Second, double Probability)>> Laws)
{
    /// <summary>Counts the pair in <paramref name="run"/>'s stored paths; null when the run stored none.</summary>
    public static PairHistogram? Of(RunFolder run, string first, string second)
    {
        ArgumentNullException.ThrowIfNull(run);
        var a = run.SamplePaths(first, int.MaxValue);
        var b = run.SamplePaths(second, int.MaxValue);
        if (a.Count == 0 || a.Count != b.Count) return null;
        var laws = new IReadOnlyList<(long, long, double)>[run.Times.Length];
        for (var k = 0; k < run.Times.Length; k++)
        {
            var cells = new SortedDictionary<(long, long), int>();
            var recorded = 0;
            for (var r = 0; r < a.Count; r++)
            {
                if (double.IsNaN(a[r][k]) || double.IsNaN(b[r][k])) continue;
                var key = ((long)a[r][k], (long)b[r][k]);
                cells[key] = cells.GetValueOrDefault(key) + 1;
                recorded++;
            }
            laws[k] = cells.Select(c => (c.Key.Item1, c.Key.Item2, (double)c.Value / recorded)).ToArray();
        }
        return new PairHistogram(first, second, a.Count, laws);
    }
}
