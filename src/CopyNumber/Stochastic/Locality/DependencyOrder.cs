namespace CopyNumber.Stochastic.Locality;

/// <summary>
/// A numbering of the reactions and species that puts what one event touches near each other in memory:
/// reverse Cuthill–McKee (Cuthill &amp; McKee 1969, Proc. 24th ACM National Conference, 157–172; the
/// reversal and the pseudo-peripheral start of George &amp; Liu 1981, Computer Solution of Large Sparse
/// Positive Definite Systems, Prentice-Hall, §4.3–4.4) on the symmetric reaction graph in which j and k are
/// neighbours when either one's firing changes a species the other reads; the species are then numbered in
/// the order the renumbered reactions first read or change them.
/// </summary>
/// <remarks>
/// The ordering narrows the band of the dependency graph: a reaction's dependents get numbers near its own,
/// so their propensity entries share cache lines and pages. It cannot do that for a graph without a narrow
/// band (a random graph has bandwidth of order M whatever the numbering), which is why the layout also packs
/// each reaction's own data together. Deterministic: ties are broken by the original index.
/// </remarks>
internal static class DependencyOrder
{
    /// <summary>
    /// The new number of each reaction (<c>Rank[j]</c> for user index j) and of each species, from the
    /// reactions' dependents and their count changes and reactant species.
    /// </summary>
    /// <param name="dependentStart">Reaction j's dependents are <paramref name="dependents"/>[start[j] .. start[j+1]−1].</param>
    /// <param name="dependents">The dependents (reactions whose propensity j's firing changes).</param>
    /// <param name="speciesOf">The species reaction j reads or changes, in the order they matter to it.</param>
    /// <param name="speciesCount">The number of species.</param>
    public static (int[] ReactionRank, int[] SpeciesRank) Compute(int[] dependentStart, int[] dependents, Func<int, IEnumerable<int>> speciesOf, int speciesCount)
    {
        var reactions = dependentStart.Length - 1;
        var neighbours = Symmetric(dependentStart, dependents, reactions);
        var order = ReverseCuthillMcKee(neighbours);
        var reactionRank = new int[reactions];
        for (var position = 0; position < reactions; position++) reactionRank[order[position]] = position;

        var speciesRank = new int[speciesCount];
        Array.Fill(speciesRank, -1);
        var next = 0;
        foreach (var j in order)
            foreach (var i in speciesOf(j))
                if (speciesRank[i] < 0) speciesRank[i] = next++;
        for (var i = 0; i < speciesCount; i++)
            if (speciesRank[i] < 0) speciesRank[i] = next++;
        return (reactionRank, speciesRank);
    }

    /// <summary>The bandwidth max |rank[j] − rank[k]| over the edges j → k: how far apart a reaction's dependents lie.</summary>
    public static int Bandwidth(int[] dependentStart, int[] dependents, int[] rank)
    {
        var width = 0;
        for (var j = 0; j < dependentStart.Length - 1; j++)
            for (var u = dependentStart[j]; u < dependentStart[j + 1]; u++)
                width = Math.Max(width, Math.Abs(rank[j] - rank[dependents[u]]));
        return width;
    }

    /// <summary>Adjacency lists of the graph with an edge j — k for every dependency j → k or k → j, without self-loops.</summary>
    private static int[][] Symmetric(int[] start, int[] dependents, int reactions)
    {
        var lists = new List<int>[reactions];
        for (var j = 0; j < reactions; j++) lists[j] = [];
        for (var j = 0; j < reactions; j++)
            for (var u = start[j]; u < start[j + 1]; u++)
            {
                var k = dependents[u];
                if (k == j) continue;
                lists[j].Add(k);
                lists[k].Add(j);
            }
        var result = new int[reactions][];
        for (var j = 0; j < reactions; j++)
        {
            lists[j].Sort();
            result[j] = lists[j].Distinct().ToArray();
        }
        return result;
    }

    /// <summary>The reverse Cuthill–McKee order of all vertices, component by component.</summary>
    private static int[] ReverseCuthillMcKee(int[][] neighbours)
    {
        var n = neighbours.Length;
        var order = new List<int>(n);
        var placed = new bool[n];
        // Components are taken in the order of their lowest-degree vertex (ties: lowest index).
        var byDegree = Enumerable.Range(0, n).OrderBy(v => neighbours[v].Length).ThenBy(v => v).ToArray();
        var scratch = new bool[n];
        foreach (var seed in byDegree)
        {
            if (placed[seed]) continue;
            var start = PseudoPeripheral(seed, neighbours, scratch);
            var first = order.Count;
            order.Add(start);
            placed[start] = true;
            for (var head = first; head < order.Count; head++)
            {
                var v = order[head];
                foreach (var w in neighbours[v].Where(w => !placed[w]).OrderBy(w => neighbours[w].Length).ThenBy(w => w))
                {
                    placed[w] = true;
                    order.Add(w);
                }
            }
        }
        order.Reverse();
        return order.ToArray();
    }

    /// <summary>
    /// A vertex of nearly greatest eccentricity in <paramref name="seed"/>'s component (George &amp; Liu 1979,
    /// ACM Trans. Math. Softw. 5:284): repeatedly move to a vertex of least degree in the last level of the
    /// level structure while the number of levels grows.
    /// </summary>
    private static int PseudoPeripheral(int seed, int[][] neighbours, bool[] seen)
    {
        var current = seed;
        var (depth, last) = Levels(current, neighbours, seen);
        while (true)
        {
            var candidate = last.OrderBy(v => neighbours[v].Length).ThenBy(v => v).First();
            var (candidateDepth, candidateLast) = Levels(candidate, neighbours, seen);
            if (candidateDepth <= depth) return current;
            (current, depth, last) = (candidate, candidateDepth, candidateLast);
        }
    }

    /// <summary>The number of breadth-first levels from <paramref name="root"/> and the vertices of the last one.</summary>
    private static (int Depth, List<int> Last) Levels(int root, int[][] neighbours, bool[] seen)
    {
        var visited = new List<int> { root };
        seen[root] = true;
        var level = new List<int> { root };
        var depth = 1;
        while (true)
        {
            var nextLevel = new List<int>();
            foreach (var v in level)
                foreach (var w in neighbours[v])
                    if (!seen[w])
                    {
                        seen[w] = true;
                        visited.Add(w);
                        nextLevel.Add(w);
                    }
            if (nextLevel.Count == 0) break;
            level = nextLevel;
            depth++;
        }
        foreach (var v in visited) seen[v] = false;
        return (depth, level);
    }
}
