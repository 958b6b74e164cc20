namespace CopyNumber.Network;

/// <summary>
/// The stoichiometric matrix N (species × reactions; entry = net copies of species i made by one firing
/// of reaction j), held dense for analysis and sparse, per reaction, for the simulators' hot loop.
/// N holds topology only: a reversible reaction is two columns, regulation is in the rate laws.
/// </summary>
public sealed class Stoichiometry
{
    private readonly long[,] _dense;
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

    /// <summary>Number of species (rows of N).</summary>
    public int SpeciesCount { get; }

    /// <summary>Number of reactions (columns of N), after reversible lines are split in two.</summary>
    public int ReactionCount { get; }

    /// <summary>Net change of <paramref name="species"/> when <paramref name="reaction"/> fires once.</summary>
    public long this[int species, int reaction] => _dense[species, reaction];

    /// <summary>The species that reaction <paramref name="reaction"/> changes, in increasing index order.</summary>
    public ReadOnlySpan<int> ChangedSpecies(int reaction) =>
        _changeSpecies.AsSpan(_changeStart[reaction], _changeStart[reaction + 1] - _changeStart[reaction]);

    /// <summary>The net changes matching <see cref="ChangedSpecies"/>, entry by entry.</summary>
    public ReadOnlySpan<long> Changes(int reaction) =>
        _changeAmount.AsSpan(_changeStart[reaction], _changeStart[reaction + 1] - _changeStart[reaction]);

    /// <summary>A copy of the dense matrix.</summary>
    public long[,] ToDense() => (long[,])_dense.Clone();

    /// <summary>Applies <paramref name="firings"/> firings of <paramref name="reaction"/> to a count vector in place.</summary>
    public void Apply(int reaction, long[] counts, long firings = 1)
    {
        var start = _changeStart[reaction];
        var end = _changeStart[reaction + 1];
        for (var e = start; e < end; e++)
            counts[_changeSpecies[e]] += firings * _changeAmount[e];
    }
}
