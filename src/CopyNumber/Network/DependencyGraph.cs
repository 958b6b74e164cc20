namespace CopyNumber.Network;

/// <summary>
/// Which propensities must be recomputed after an event: for each reaction j, the reactions whose law
/// reads a species that j changes (Gibson &amp; Bruck 2000, J. Phys. Chem. A 104:1876). Also, for each
/// species, the reactions whose law reads it, for schedule events that set a count directly.
/// Stored as compressed rows so the hot loop walks a contiguous span.
/// </summary>
public sealed class DependencyGraph
{
    private readonly int[] _affectedStart;
    private readonly int[] _affected;
    private readonly int[] _readersStart;
    private readonly int[] _readers;

    /// <summary>
    /// Builds the graph from N and, for each reaction, the species its law reads.
    /// </summary>
    /// <param name="stoichiometry">The network's N.</param>
    /// <param name="speciesRead">For each reaction, the indices of the species its propensity depends on.</param>
    public DependencyGraph(Stoichiometry stoichiometry, IReadOnlyList<IReadOnlyCollection<int>> speciesRead)
    {
        var reactions = stoichiometry.ReactionCount;
        var readersOf = new List<int>[stoichiometry.SpeciesCount];
        for (var i = 0; i < readersOf.Length; i++) readersOf[i] = new List<int>();
        for (var j = 0; j < reactions; j++)
            foreach (var i in speciesRead[j].Distinct().Order())
                readersOf[i].Add(j);

        (_readersStart, _readers) = Compress(readersOf.Select(r => (IEnumerable<int>)r).ToList());

        var affected = new List<IEnumerable<int>>(reactions);
        for (var j = 0; j < reactions; j++)
        {
            var set = new SortedSet<int>();
            foreach (var i in stoichiometry.ChangedSpecies(j))
                set.UnionWith(readersOf[i]);
            affected.Add(set);
        }
        (_affectedStart, _affected) = Compress(affected);
    }

    /// <summary>Reactions whose propensity can change when <paramref name="reaction"/> fires (sorted).</summary>
    public ReadOnlySpan<int> Affected(int reaction) =>
        _affected.AsSpan(_affectedStart[reaction], _affectedStart[reaction + 1] - _affectedStart[reaction]);

    /// <summary>Reactions whose propensity reads <paramref name="species"/> (sorted).</summary>
    public ReadOnlySpan<int> Readers(int species) =>
        _readers.AsSpan(_readersStart[species], _readersStart[species + 1] - _readersStart[species]);

    private static (int[] Start, int[] Items) Compress(IReadOnlyList<IEnumerable<int>> rows)
    {
        var start = new int[rows.Count + 1];
        var items = new List<int>();
        for (var r = 0; r < rows.Count; r++)
        {
            start[r] = items.Count;
            items.AddRange(rows[r]);
        }
        start[rows.Count] = items.Count;
        return (start, items.ToArray());
    }
}
