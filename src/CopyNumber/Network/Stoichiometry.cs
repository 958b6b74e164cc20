namespace CopyNumber.Network;

/// <summary>
/// The stoichiometric matrix N (species × reactions; entry = net copies of species i made by one firing
/// of reaction j), held dense for analysis and sparse, per reaction, for the simulators' hot loop.
/// N holds topology only: a reversible reaction is two columns, regulation is in the rate laws.
/// </summary>
public sealed class Stoichiometry
{
    private readonly long[,]? _dense;   // null when built from columns; ToDense then assembles it
    private readonly int[] _changeStart;
    private readonly int[] _changeSpecies;
    private readonly long[] _changeAmount;

    /// <summary>Builds N from its dense form; zero entries are left out of the sparse form.</summary>
    public Stoichiometry(long[,] dense)
    {
        _dense = (long[,])dense.Clone();
        SpeciesCount = dense.GetLength(0);
        ReactionCount = dense.GetLength(1);
        _changeStart = new int[ReactionCount + 1];
        var species = new List<int>();
        var amount = new List<long>();
        for (var j = 0; j < ReactionCount; j++)
        {
            _changeStart[j] = species.Count;
            for (var i = 0; i < SpeciesCount; i++)
            {
                if (dense[i, j] == 0) continue;
                species.Add(i);
                amount.Add(dense[i, j]);
            }
        }
        _changeStart[ReactionCount] = species.Count;
        _changeSpecies = species.ToArray();
        _changeAmount = amount.ToArray();
    }

    /// <summary>
    /// Builds N from its columns without ever holding the dense matrix, for networks too large for
    /// species × reactions entries (the simulators read only the sparse form). Entries of one species in
    /// a column are added up; zero entries are left out.
    /// </summary>
    /// <param name="speciesCount">Number of species (rows).</param>
    /// <param name="columns">Per reaction, (species, net change) entries in any order.</param>
    public Stoichiometry(int speciesCount, IReadOnlyList<IReadOnlyList<(int Species, long Change)>> columns)
    {
        SpeciesCount = speciesCount;
        ReactionCount = columns.Count;
        _changeStart = new int[ReactionCount + 1];
        var species = new List<int>();
        var amount = new List<long>();
        for (var j = 0; j < ReactionCount; j++)
        {
            _changeStart[j] = species.Count;
            foreach (var group in columns[j].GroupBy(e => e.Species).OrderBy(g => g.Key))
            {
                if ((uint)group.Key >= (uint)speciesCount) throw new ArgumentException($"reaction {j} names species index {group.Key}, outside the {speciesCount} species", nameof(columns));
                var net = group.Sum(e => e.Change);
                if (net == 0) continue;
                species.Add(group.Key);
                amount.Add(net);
            }
        }
        _changeStart[ReactionCount] = species.Count;
        _changeSpecies = species.ToArray();
        _changeAmount = amount.ToArray();
    }

    /// <summary>Number of species (rows of N).</summary>
    public int SpeciesCount { get; }

    /// <summary>Number of reactions (columns of N), after reversible lines are split in two.</summary>
    public int ReactionCount { get; }

    /// <summary>Net change of <paramref name="species"/> when <paramref name="reaction"/> fires once.</summary>
    public long this[int species, int reaction] => _dense?[species, reaction] ?? SparseEntry(species, reaction);

    /// <summary>The species that reaction <paramref name="reaction"/> changes, in increasing index order.</summary>
    public ReadOnlySpan<int> ChangedSpecies(int reaction) =>
        _changeSpecies.AsSpan(_changeStart[reaction], _changeStart[reaction + 1] - _changeStart[reaction]);

    /// <summary>The net changes matching <see cref="ChangedSpecies"/>, entry by entry.</summary>
    public ReadOnlySpan<long> Changes(int reaction) =>
        _changeAmount.AsSpan(_changeStart[reaction], _changeStart[reaction + 1] - _changeStart[reaction]);

    /// <summary>A copy of the dense matrix.</summary>
    public long[,] ToDense()
    {
        if (_dense is not null) return (long[,])_dense.Clone();
        var dense = new long[SpeciesCount, ReactionCount];
        for (var j = 0; j < ReactionCount; j++)
            for (var e = _changeStart[j]; e < _changeStart[j + 1]; e++)
                dense[_changeSpecies[e], j] = _changeAmount[e];
        return dense;
    }

    private long SparseEntry(int species, int reaction)
    {
        if ((uint)species >= (uint)SpeciesCount) throw new IndexOutOfRangeException();
        for (var e = _changeStart[reaction]; e < _changeStart[reaction + 1]; e++)
            if (_changeSpecies[e] == species) return _changeAmount[e];
        return 0;
    }

    /// <summary>Applies <paramref name="firings"/> firings of <paramref name="reaction"/> to a count vector in place.</summary>
    public void Apply(int reaction, long[] counts, long firings = 1)
    {
        var start = _changeStart[reaction];
        var end = _changeStart[reaction + 1];
        for (var e = start; e < end; e++)
            counts[_changeSpecies[e]] += firings * _changeAmount[e];
    }
}
