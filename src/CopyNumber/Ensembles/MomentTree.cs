namespace CopyNumber.Ensembles;

/// <summary>
/// The moments of a run's real-valued readouts, combined over its replicate blocks in one fixed
/// pattern, so that the same replicates give the same bits however the run was split: over threads,
/// into an interrupted run and its resumption, or into shards merged later.
/// </summary>
/// <remarks>
/// <para>Floating-point merging is not associative (see <see cref="MomentAccumulator"/>), so the pattern
/// must not depend on which blocks happened to be finished together. It is a binary tree over the
/// block indices 0 … B − 1: a leaf holds one block's replicates added in replicate order; node
/// (ℓ, i) covers blocks i·2^ℓ … min((i + 1)·2^ℓ, B) − 1 and is its left child merged with its right child
/// (Chan, Golub &amp; LeVeque 1983, eq. 2.1), or its left child unchanged when the right one covers no
/// block. The root (h, 0), 2^h ≥ B, holds the whole run. This is pairwise combination, which also
/// keeps the rounding error growing like log B rather than B (Higham 1993, "The accuracy of floating
/// point summation", SIAM J. Sci. Comput. 14:783–799).</para>
/// <para>The tree stores only its maximal complete nodes: adding a node whose sibling is present merges
/// the two into their parent, and so on upwards. A run interrupted at any moment is therefore a short
/// list of nodes (a few per gap in its finished blocks) whatever its size, and adding the nodes of two
/// runs over disjoint blocks, in any order, ends in exactly the nodes one run over their union would
/// hold. Each node holds one accumulator per cell (grid point × real readout). Not thread-safe.</para>
/// </remarks>
public sealed class MomentTree
{
    private readonly Dictionary<(int Level, long Index), MomentAccumulator[]> _nodes = new();
    private readonly Stack<MomentAccumulator[]> _spare = new();

    /// <summary>An empty tree over <paramref name="totalBlocks"/> blocks with <paramref name="cells"/> accumulators per node.</summary>
    public MomentTree(long totalBlocks, int cells)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(totalBlocks, 1);
        ArgumentOutOfRangeException.ThrowIfNegative(cells);
        TotalBlocks = totalBlocks;
        Cells = cells;
        while ((1L << Height) < totalBlocks) Height++;
    }

    /// <summary>B, the number of blocks of the whole run.</summary>
    public long TotalBlocks { get; }

    /// <summary>Accumulators per node: grid points × real readouts, grid point major.</summary>
    public int Cells { get; }

    /// <summary>h, the level of the root: the smallest with 2^h ≥ B.</summary>
    public int Height { get; }

    /// <summary>The stored nodes, ordered by their first block.</summary>
    public IReadOnlyList<MomentTreeNode> Nodes =>
        _nodes.Select(n => new MomentTreeNode(n.Key.Level, n.Key.Index, FirstBlock(n.Key.Level, n.Key.Index), EndBlock(n.Key.Level, n.Key.Index), n.Value))
            .OrderBy(n => n.FirstBlock).ToArray();

    /// <summary>The first block node (<paramref name="level"/>, <paramref name="index"/>) covers.</summary>
    public long FirstBlock(int level, long index) => index << level;

    /// <summary>One past the last block node (<paramref name="level"/>, <paramref name="index"/>) covers.</summary>
    public long EndBlock(int level, long index) => Math.Min(TotalBlocks, (index + 1) << level);

    /// <summary>A cleared set of accumulators for a new leaf, reused from merged nodes when there are any.</summary>
    public MomentAccumulator[] RentLeaf()
    {
        if (_spare.TryPop(out var cells))
        {
            foreach (var c in cells) c.Clear();
            return cells;
        }
        cells = new MomentAccumulator[Cells];
        for (var c = 0; c < cells.Length; c++) cells[c] = new MomentAccumulator();
        return cells;
    }

    /// <summary>Adds block <paramref name="block"/>'s accumulators (ownership passes to the tree).</summary>
    public void AddBlock(long block, MomentAccumulator[] cells) => Add(0, block, cells);

    /// <summary>
    /// Adds node (<paramref name="level"/>, <paramref name="index"/>); ownership of <paramref name="cells"/>
    /// passes to the tree. The caller guarantees that no block it covers is already in the tree.
    /// </summary>
    /// <exception cref="ArgumentException">The node lies outside the tree, has the wrong number of cells, or is already present.</exception>
    public void Add(int level, long index, MomentAccumulator[] cells)
    {
        ArgumentNullException.ThrowIfNull(cells);
        if (cells.Length != Cells) throw new ArgumentException($"a node holds {Cells} accumulators, not {cells.Length}", nameof(cells));
        if (level < 0 || level > Height || index < 0 || FirstBlock(level, index) >= TotalBlocks)
            throw new ArgumentException($"node ({level}, {index}) lies outside a tree over {TotalBlocks} blocks", nameof(index));
        while (level < Height)
        {
            var sibling = index ^ 1;
            if (FirstBlock(level, sibling) >= TotalBlocks)
            {
                // The right sibling covers no block: the parent is this node unchanged.
            }
            else if (_nodes.Remove((level, sibling), out var other))
            {
                var (left, right) = (index & 1) == 0 ? (cells, other) : (other, cells);
                for (var c = 0; c < left.Length; c++) left[c].Merge(right[c]);
                _spare.Push(right);
                cells = left;
            }
            else break;
            level++;
            index >>= 1;
        }
        if (!_nodes.TryAdd((level, index), cells))
            throw new ArgumentException($"node ({level}, {index}) is already in the tree: its blocks were added twice", nameof(index));
    }

    /// <summary>Adds copies of every node of <paramref name="other"/>, a tree of the same shape over disjoint blocks.</summary>
    /// <exception cref="ArgumentException">The trees differ in shape, or share a node.</exception>
    public void AddCopiesOf(MomentTree other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (other.TotalBlocks != TotalBlocks || other.Cells != Cells)
            throw new ArgumentException($"cannot combine a tree over {other.TotalBlocks} blocks × {other.Cells} cells with one over {TotalBlocks} × {Cells}", nameof(other));
        foreach (var node in other.Nodes)
            Add(node.Level, node.Index, node.Cells.Select(c => MomentAccumulator.FromState(c.State)).ToArray());
    }

    /// <summary>
    /// The moments of everything added, as fresh accumulators: the root's when every block is in, and
    /// otherwise the stored nodes merged from the first block to the last.
    /// </summary>
    public MomentAccumulator[] Summarise()
    {
        var total = new MomentAccumulator[Cells];
        for (var c = 0; c < total.Length; c++) total[c] = new MomentAccumulator();
        foreach (var node in Nodes)
            for (var c = 0; c < total.Length; c++) total[c].Merge(node.Cells[c]);
        return total;
    }
}

/// <summary>One stored node of a <see cref="MomentTree"/>.</summary>
/// <param name="Level">ℓ: the node covers up to 2^ℓ blocks.</param>
/// <param name="Index">i: the node covers blocks from i·2^ℓ.</param>
/// <param name="FirstBlock">The first block covered.</param>
/// <param name="EndBlock">One past the last block covered.</param>
/// <param name="Cells">One accumulator per grid point × real readout, grid point major; do not change them.</param>
public sealed record MomentTreeNode(int Level, long Index, long FirstBlock, long EndBlock, IReadOnlyList<MomentAccumulator> Cells);
