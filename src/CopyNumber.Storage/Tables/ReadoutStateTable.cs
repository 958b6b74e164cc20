using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// <c>readout-state.parquet</c>, written when the model has real-valued readouts, species pairs whose covariance is
/// accumulated or parameters that vary per cell: the exact state of their moment accumulators, one row per (stored node
/// of the <see cref="MomentTree"/>, time, readout, pair sum "U+V" or noise estimator "X/intrinsic", "X/extrinsic"; see
/// <see cref="EnsembleResult.TreeCellNames"/>).
/// Columns: <c>level</c>, <c>node</c> (node (ℓ, i) covers blocks i·2^ℓ up to <c>end_block</c>),
/// <c>first_block</c>, <c>end_block</c> (one past the last), <c>time</c>, <c>readout</c>, <c>count</c>,
/// <c>non_finite</c>, <c>mean</c>, <c>squared_deviations</c> (Σ(x − mean)²), <c>min</c>, <c>max</c>.
/// A finished unsplit run stores the root alone; an interrupted run or a shard stores a few nodes.
/// Doubles are stored bit for bit, so resuming and merging reproduce the unsplit run's moments exactly.
/// </summary>
public static class ReadoutStateTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
        ["level", "node", "first_block", "end_block", "time", "readout", "count", "non_finite", "mean", "squared_deviations", "min", "max"];

    /// <summary>Writes the stored nodes of <paramref name="result"/>'s moment tree, a row group per node.</summary>
    public static void Write(string path, EnsembleResult result, IReadOnlyDictionary<string, string> metadata)
    {
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "readout" => ColumnType.String,
            "time" or "mean" or "squared_deviations" or "min" or "max" => ColumnType.Double,
            _ => ColumnType.Int64,
        })).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var names = result.TreeCellNames;
        var rows = result.Grid.Count * names.Count;
        foreach (var node in result.MomentTree.Nodes)
        {
            var level = new long[rows];
            var index = new long[rows];
            var first = new long[rows];
            var end = new long[rows];
            var time = new double[rows];
            var readout = new string[rows];
            var count = new long[rows];
            var nonFinite = new long[rows];
            var mean = new double[rows];
            var squares = new double[rows];
            var min = new double[rows];
            var max = new double[rows];
            for (var k = 0; k < result.Grid.Count; k++)
            {
                for (var q = 0; q < names.Count; q++)
                {
                    var row = k * names.Count + q;
                    var state = node.Cells[row].State;
                    level[row] = node.Level;
                    index[row] = node.Index;
                    first[row] = node.FirstBlock;
                    end[row] = node.EndBlock;
                    time[row] = result.Grid[k];
                    readout[row] = names[q];
                    count[row] = state.Count;
                    nonFinite[row] = state.NonFiniteCount;
                    mean[row] = state.Mean;
                    squares[row] = state.SquaredDeviations;
                    min[row] = state.Minimum;
                    max[row] = state.Maximum;
                }
            }
            writer.WriteRowGroup([level, index, first, end, time, readout, count, nonFinite, mean, squares, min, max]);
        }
        writer.Complete();
    }

    /// <summary>The moment tree stored in <paramref name="reader"/>'s file, for a run over <paramref name="totalBlocks"/> blocks.</summary>
    /// <exception cref="RunFolderException">The file is incomplete or names a node, time or readout the run does not have.</exception>
    internal static MomentTree Read(ParquetTableReader reader, TimeGrid grid, IReadOnlyList<string> cellNames, long totalBlocks)
    {
        var tree = new MomentTree(totalBlocks, grid.Count * cellNames.Count);
        var points = StoredCells.GridIndex(grid);
        var names = cellNames.Select((n, i) => (n, i)).ToDictionary(x => x.n, x => x.i, StringComparer.Ordinal);
        var nodes = new Dictionary<(int Level, long Index), (MomentAccumulator?[] Cells, int Filled)>();
        for (var g = 0; g < reader.RowGroups; g++)
        {
            var level = reader.Longs("level", g);
            var index = reader.Longs("node", g);
            var time = reader.Doubles("time", g);
            var readout = reader.Strings("readout", g);
            var count = reader.Longs("count", g);
            var nonFinite = reader.Longs("non_finite", g);
            var mean = reader.Doubles("mean", g);
            var squares = reader.Doubles("squared_deviations", g);
            var min = reader.Doubles("min", g);
            var max = reader.Doubles("max", g);
            for (var row = 0; row < level.Length; row++)
            {
                if (level[row] < 0 || level[row] > tree.Height) throw reader.Damaged($"it holds a node at level {level[row]}, outside a tree over {totalBlocks} blocks");
                var key = ((int)level[row], index[row]);
                if (!nodes.TryGetValue(key, out var node)) node = (new MomentAccumulator?[tree.Cells], 0);
                var cell = StoredCells.Find(points, time[row], reader, "time") * cellNames.Count + StoredCells.Find(names, readout[row], reader, "readout");
                if (node.Cells[cell] is not null) throw reader.Damaged($"node ({key.Item1}, {key.Item2}) repeats time {time[row]} of readout '{readout[row]}'");
                var state = new MomentState(count[row], nonFinite[row], mean[row], squares[row], min[row], max[row]);
                if (state.Problem() is { } problem) throw reader.Damaged($"node ({key.Item1}, {key.Item2}) at time {time[row]}, readout '{readout[row]}': {problem}");
                node.Cells[cell] = MomentAccumulator.FromState(state);
                nodes[key] = (node.Cells, node.Filled + 1);
            }
        }
        foreach (var ((level, index), (cells, filled)) in nodes)
        {
            if (filled != tree.Cells) throw reader.Damaged($"node ({level}, {index}) has {filled} of its {tree.Cells} rows");
            try
            {
                tree.Add(level, index, cells!);
            }
            catch (ArgumentException e)
            {
                throw reader.Damaged(e.Message, e);
            }
        }
        return tree;
    }
}
