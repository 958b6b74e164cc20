using CopyNumber.Network;

namespace CopyNumber.MasterEquation;

/// <summary>
/// How a state is stored: the counts of the <em>stored</em> species only, as 32-bit integers; every
/// other count follows from them. When the schedule never changes a species, the stored species are
/// the independent ones of <see cref="StoichiometricStructure"/> and the dependent ones are recovered
/// from the conservation laws, x_D = L_D⁻¹(T − L_I·x_I), so a state costs 4·rank bytes instead of
/// 4·species. A schedule that changes a species moves probability between conservation classes (the
/// totals T change), so for such a model every species is stored. Immutable; shared by threads.
/// </summary>
public sealed class StateCoding
{
    private readonly int[] _stored;
    private readonly int[] _dependent;
    private readonly double[,] _solve;      // L_D⁻¹, dependent × laws
    private readonly long[,] _lawsOnStored; // L restricted to the stored species, laws × stored
    private readonly long[] _totals;

    private StateCoding(int speciesCount, int[] stored, int[] dependent, double[,] solve, long[,] lawsOnStored, long[] totals, IReadOnlyList<ConservationLaw> laws)
    {
        SpeciesCount = speciesCount;
        _stored = stored;
        _dependent = dependent;
        _solve = solve;
        _lawsOnStored = lawsOnStored;
        _totals = totals;
        Laws = laws;
    }

    /// <summary>Number of species in a full count vector.</summary>
    public int SpeciesCount { get; }

    /// <summary>Number of stored coordinates per state (the dimension of the projection).</summary>
    public int Dimension => _stored.Length;

    /// <summary>The stored species, in increasing index order.</summary>
    public IReadOnlyList<int> StoredSpecies => _stored;

    /// <summary>The conservation laws used to recover the other species (empty when every species is stored).</summary>
    public IReadOnlyList<ConservationLaw> Laws { get; }

    /// <summary>The coding for <paramref name="network"/>: reduced by its conservation laws unless its schedule changes a species.</summary>
    public static StateCoding For(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var s = network.Species.Count;
        // A schedule that sets species moves states off the conservation laws; a network too large for the exact
        // structure keeps every species (its projection is bounded by --max-states in any case).
        if (network.Schedule.Any(c => c.Target == ScheduleTarget.Species) || !StoichiometricStructure.IsAnalysable(network.Stoichiometry))
            return new StateCoding(s, Enumerable.Range(0, s).ToArray(), [], new double[0, 0], new long[0, 0], [], []);
        var structure = StoichiometricStructure.Analyze(network.Stoichiometry, network.InitialCounts);
        var stored = structure.IndependentSpecies.ToArray();
        var dependent = structure.DependentSpecies.ToArray();
        var laws = structure.ConservationLaws;
        var m = laws.Count;
        var matrix = new double[m, m];
        for (var k = 0; k < m; k++)
            for (var d = 0; d < m; d++) matrix[k, d] = laws[k].Coefficients[dependent[d]];
        var lawsOnStored = new long[m, stored.Length];
        for (var k = 0; k < m; k++)
            for (var i = 0; i < stored.Length; i++) lawsOnStored[k, i] = laws[k].Coefficients[stored[i]];
        return new StateCoding(s, stored, dependent, Invert(matrix), lawsOnStored, laws.Select(l => l.Total).ToArray(), laws);
    }

    /// <summary>
    /// Writes the stored coordinates of the full count vector <paramref name="counts"/> into
    /// <paramref name="key"/>; false when a count is negative or does not fit in 32 bits.
    /// </summary>
    public bool TryEncode(ReadOnlySpan<long> counts, Span<int> key)
    {
        for (var i = 0; i < _stored.Length; i++)
        {
            var x = counts[_stored[i]];
            if (x < 0 || x > int.MaxValue) return false;
            key[i] = (int)x;
        }
        return true;
    }

    /// <summary>
    /// Fills the full count vector of the state with stored coordinates <paramref name="key"/>; false when
    /// the conservation laws give a dependent species a negative count (the state is not a state).
    /// </summary>
    public bool TryDecode(ReadOnlySpan<int> key, long[] counts)
    {
        for (var i = 0; i < _stored.Length; i++) counts[_stored[i]] = key[i];
        if (_dependent.Length == 0) return true;
        var m = _dependent.Length;
        Span<double> rhs = stackalloc double[m];
        for (var k = 0; k < m; k++)
        {
            long r = _totals[k];
            for (var i = 0; i < _stored.Length; i++) r -= _lawsOnStored[k, i] * key[i];
            rhs[k] = r;
        }
        var valid = true;
        for (var d = 0; d < m; d++)
        {
            var x = 0.0;
            for (var k = 0; k < m; k++) x += _solve[d, k] * rhs[k];
            var rounded = (long)Math.Round(x);
            counts[_dependent[d]] = rounded;
            if (rounded < 0) valid = false;
        }
        return valid;
    }

    /// <summary>Bytes one stored state takes in the index: its coordinates and its hash slots at the largest load.</summary>
    public long BytesPerStateInIndex => 4L * Dimension + 2 * sizeof(int);

    private static double[,] Invert(double[,] a)
    {
        var n = a.GetLength(0);
        var m = new double[n, 2 * n];
        for (var i = 0; i < n; i++)
        {
            for (var j = 0; j < n; j++) m[i, j] = a[i, j];
            m[i, n + i] = 1;
        }
        for (var c = 0; c < n; c++)
        {
            var pivot = c;
            for (var r = c + 1; r < n; r++) if (Math.Abs(m[r, c]) > Math.Abs(m[pivot, c])) pivot = r;
            if (m[pivot, c] == 0) throw new InvalidOperationException("the conservation laws restricted to the dependent species are singular");
            for (var j = 0; j < 2 * n; j++) (m[c, j], m[pivot, j]) = (m[pivot, j], m[c, j]);
            var scale = m[c, c];
            for (var j = 0; j < 2 * n; j++) m[c, j] /= scale;
            for (var r = 0; r < n; r++)
            {
                if (r == c || m[r, c] == 0) continue;
                var f = m[r, c];
                for (var j = 0; j < 2 * n; j++) m[r, j] -= f * m[c, j];
            }
        }
        var inverse = new double[n, n];
        for (var i = 0; i < n; i++)
            for (var j = 0; j < n; j++) inverse[i, j] = m[i, n + j];
        return inverse;
    }
}
