namespace CopyNumber.Network;

/// <summary>
/// Which propensities must be recomputed after an event: for each reaction j, the reactions whose law
/// reads a species that j changes (Gibson &amp; Bruck 2000, J. Phys. Chem. A 104:1876). Also, for each
/// species, the reactions whose law reads it. Stored as compressed rows so the hot loop walks a
/// contiguous span.
/// </summary>
/// <remarks>
/// Memory is linear in the network: the reader lists hold one entry per (reaction, species read), and a
/// reaction's own list of affected reactions is stored only while it is short — at most
/// <see cref="BroadLimit"/> entries, counted as the sum of the reader lists of the species it changes.
/// A longer list is left to be walked through those reader lists (<see cref="IsBroad"/>): stored, the
/// lists of 20 000 reactions that all read and change one species would hold 20 000² = 4·10⁸ entries,
/// while walked they cost the same per event and nothing in memory.
/// </remarks>
public sealed class DependencyGraph
{
    /// <summary>The longest affected list stored per reaction; longer ones are walked through the reader lists.</summary>
    public const int BroadLimit = 32;

    private readonly int[] _affectedStart;
    private readonly int[] _affected;
    private readonly int[] _readersStart;
    private readonly int[] _readers;
    private readonly bool[] _broad;

    /// <summary>
    /// Builds the graph from N and, for each reaction, the species its law reads.
    /// </summary>
    /// <param name="stoichiometry">The network's N.</param>
    /// <param name="speciesRead">For each reaction, the indices of the species its propensity depends on.</param>
    public DependencyGraph(Stoichiometry stoichiometry, IReadOnlyList<IReadOnlyCollection<int>> speciesRead)
    {
        var reactions = stoichiometry.ReactionCount;
        var species = stoichiometry.SpeciesCount;
        // Reader lists by counting sort: reactions in increasing order within each species' row.
        _readersStart = new int[species + 1];
        var marked = new int[Math.Max(species, reactions)];
        Array.Fill(marked, -1);
        for (var j = 0; j < reactions; j++)
            foreach (var i in speciesRead[j])
                if (marked[i] != j) { marked[i] = j; _readersStart[i + 1]++; }
        for (var i = 0; i < species; i++) _readersStart[i + 1] += _readersStart[i];
        _readers = new int[_readersStart[species]];
        var fill = _readersStart[..species];
        Array.Fill(marked, -1);
        for (var j = 0; j < reactions; j++)
            foreach (var i in speciesRead[j])
                if (marked[i] != j) { marked[i] = j; _readers[fill[i]++] = j; }

        _broad = new bool[reactions];
        _affectedStart = new int[reactions + 1];
        var affected = new List<int>();
        Array.Fill(marked, -1);
        for (var j = 0; j < reactions; j++)
        {
            _affectedStart[j] = affected.Count;
            var bound = 0L;
            foreach (var i in stoichiometry.ChangedSpecies(j)) bound += Readers(i).Length;
            if (bound > BroadLimit)
            {
                _broad[j] = true;
                continue;
            }
            var first = affected.Count;
            foreach (var i in stoichiometry.ChangedSpecies(j))
                foreach (var k in Readers(i))
                    if (marked[k] != j) { marked[k] = j; affected.Add(k); }
            affected.Sort(first, affected.Count - first, Comparer<int>.Default);
        }
        _affectedStart[reactions] = affected.Count;
        _affected = affected.ToArray();
    }

    /// <summary>
    /// Whether <paramref name="reaction"/>'s affected list is too long to store: it is then the union of
    /// <see cref="Readers"/> over the species the reaction changes, and <see cref="Affected"/> is empty.
    /// </summary>
    public bool IsBroad(int reaction) => _broad[reaction];

    /// <summary>
    /// Reactions whose propensity can change when <paramref name="reaction"/> fires (sorted); empty for a
    /// reaction that <see cref="IsBroad"/>.
    /// </summary>
    public ReadOnlySpan<int> Affected(int reaction) =>
        _affected.AsSpan(_affectedStart[reaction], _affectedStart[reaction + 1] - _affectedStart[reaction]);

    /// <summary>Reactions whose propensity reads <paramref name="species"/> (sorted).</summary>
    public ReadOnlySpan<int> Readers(int species) =>
        _readers.AsSpan(_readersStart[species], _readersStart[species + 1] - _readersStart[species]);

    /// <summary>
    /// Reaction and species indices the graph stores, row starts included: at most
    /// (<see cref="BroadLimit"/> + 2)·reactions + species + 1 + the number of (reaction, species read) pairs.
    /// </summary>
    public long StoredEntries => _affectedStart.LongLength + _affected.LongLength + _readersStart.LongLength + _readers.LongLength;

    /// <summary>Bytes of the graph's arrays, for the memory estimate.</summary>
    public long Bytes => 4 * StoredEntries + _broad.LongLength;
}
