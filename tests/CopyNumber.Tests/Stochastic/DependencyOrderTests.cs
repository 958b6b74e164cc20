using CopyNumber.Stochastic.Locality;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The reverse Cuthill–McKee numbering of <see cref="DependencyOrder"/> on graphs whose best bandwidth is
/// known: a path (bandwidth 1, which Cuthill–McKee from an end attains) and a w × h grid, whose level
/// structure from a corner has levels of at most w vertices, so the ordering's bandwidth is at most
/// 2w − 1 (George &amp; Liu 1981, Computer Solution of Large Sparse Positive Definite Systems, §4.3: an ordering
/// level by level has bandwidth below the largest sum of two adjacent levels), and no ordering does better
/// than w = min(w, h) (Chvátalová 1975, Discrete Math. 11:249, the bandwidth of the grid; quoted from
/// memory), which the check uses as a floor that cannot be beaten. The vertices are shuffled
/// first, so the input's own numbering is far from narrow.
/// </summary>
public class DependencyOrderTests
{
    [Theory]
    [InlineData(2)]
    [InlineData(50)]
    [InlineData(1000)]
    public void A_shuffled_path_gets_bandwidth_one(int n)
    {
        var label = Shuffled(n, seed: n);
        var edges = Enumerable.Range(0, n - 1).Select(v => (label[v], label[v + 1])).ToList();
        var (start, dependents) = Lists(n, edges);
        var (rank, species) = DependencyOrder.Compute(start, dependents, _ => [], 0);
        AssertPermutation(rank);
        Assert.Empty(species);
        Assert.True(n < 3 || DependencyOrder.Bandwidth(start, dependents, label) > 1, "the shuffle left the path narrow");
        Assert.Equal(1, DependencyOrder.Bandwidth(start, dependents, rank));
    }

    [Theory]
    [InlineData(4, 30)]
    [InlineData(10, 10)]
    [InlineData(7, 100)]
    public void A_shuffled_grid_gets_bandwidth_below_twice_its_width(int width, int height)
    {
        var n = width * height;
        var label = Shuffled(n, seed: n);
        var edges = new List<(int, int)>();
        for (var y = 0; y < height; y++)
            for (var x = 0; x < width; x++)
            {
                if (x + 1 < width) edges.Add((label[y * width + x], label[y * width + x + 1]));
                if (y + 1 < height) edges.Add((label[(y + 1) * width + x], label[y * width + x]));
            }
        var (start, dependents) = Lists(n, edges);
        var (rank, _) = DependencyOrder.Compute(start, dependents, _ => [], 0);
        AssertPermutation(rank);
        Assert.True(DependencyOrder.Bandwidth(start, dependents, label) > 4 * width, "the shuffle left the grid narrow");
        Assert.InRange(DependencyOrder.Bandwidth(start, dependents, rank), width, 2 * width - 1);
    }

    [Fact]
    public void Species_are_numbered_in_the_order_the_renumbered_reactions_use_them()
    {
        // Reactions 0 → 1 → 2 (a path); reaction j uses species 2 − j and species 3 only; species 4 is unused.
        var (start, dependents) = Lists(3, [(0, 1), (1, 2)]);
        var (rank, species) = DependencyOrder.Compute(start, dependents, j => [2 - j, 3], 5);
        var order = Enumerable.Range(0, 3).OrderBy(j => rank[j]).ToArray();
        Assert.Equal(0, species[2 - order[0]]);
        Assert.Equal(1, species[3]);
        Assert.Equal(4, species[4]);
        AssertPermutation(species);
    }

    private static int[] Shuffled(int n, int seed)
    {
        var label = Enumerable.Range(0, n).ToArray();
        new Random(seed).Shuffle(label);
        return label;
    }

    /// <summary>Directed lists j → k for each edge, as the dependency graph stores them (one direction suffices).</summary>
    private static (int[] Start, int[] Dependents) Lists(int n, IReadOnlyList<(int From, int To)> edges)
    {
        var start = new int[n + 1];
        var lists = Enumerable.Range(0, n).Select(_ => new List<int>()).ToArray();
        foreach (var (from, to) in edges) lists[from].Add(to);
        var dependents = new List<int>();
        for (var v = 0; v < n; v++)
        {
            start[v] = dependents.Count;
            dependents.AddRange(lists[v].Order());
        }
        start[n] = dependents.Count;
        return (start, dependents.ToArray());
    }

    private static void AssertPermutation(int[] rank) => Assert.Equal(Enumerable.Range(0, rank.Length), rank.Order());
}
