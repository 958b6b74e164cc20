using System.Numerics;

namespace CopyNumber.Network;

/// <summary>
/// The linear structure of the stoichiometric matrix N (species × reactions), computed exactly over the
/// integers: its rank, the conservation laws (a basis of the left null space {c : cᵀN = 0}), and the split
/// of species into independent ones and dependent ones fixed by the laws (the link-matrix reduction of
/// Reder 1988, J. Theor. Biol. 135:175; conservation relations as in Heinrich &amp; Schuster 1996,
/// The Regulation of Cellular Systems).
/// </summary>
/// <remarks>
/// <para>
/// How the basis is made. Nᵀ is brought to integer reduced row echelon form (species are its columns,
/// scanned in declaration order). Pivot species are the independent ones: each is the earliest species
/// whose row of N is not a combination of the rows before it, so dependent species come as late in
/// declaration order as the network allows. Each free species f gives one law: coefficient at f, the
/// echelon solution at the pivot species, zero at every other free species; it is divided by the gcd of
/// its entries and its first nonzero coefficient made positive. A species no reaction changes is free
/// and its law is the unit vector xᵢ = xᵢ(0).
/// </para>
/// <para>
/// Readability step (deterministic). While some law has negative coefficients, laws are visited in
/// order and for each law with negatives the other laws are tried in order, first added then subtracted;
/// the first sum or difference (made primitive, first nonzero entry positive) that has fewer negative coefficients
/// and no more nonzero coefficients replaces the law. Each replacement lowers the total count of negative
/// coefficients, so the step ends. Replacing a law by itself ± another law keeps the span, so the basis
/// still spans the left null space exactly. For E + S ⇌ ES → E + P the echelon form gives E + ES and
/// E − S − P; subtracting the first from the second and fixing the sign gives S + ES + P.
/// </para>
/// <para>
/// Laws and dependent species are listed together: law k was built to solve for
/// <see cref="DependentSpecies"/>[k]. After the readability step a law may also touch other dependent
/// species, but the laws restricted to the dependent species always form an invertible matrix, so the
/// independent counts and the totals determine the dependent counts.
/// </para>
/// </remarks>
public sealed class StoichiometricStructure
{
    private StoichiometricStructure(
        int rank,
        ConservationLaw[] laws,
        int[] independent,
        int[] dependent,
        int[] unchanged)
    {
        Rank = rank;
        ConservationLaws = laws.AsReadOnly();
        IndependentSpecies = independent.AsReadOnly();
        DependentSpecies = dependent.AsReadOnly();
        UnchangedSpecies = unchanged.AsReadOnly();
    }

    /// <summary>Rank of N, computed exactly.</summary>
    public int Rank { get; }

    /// <summary>
    /// An integer basis of the left null space of N, one law per dependent species (species count − rank
    /// laws), each primitive with its first nonzero coefficient positive; totals from the initial counts.
    /// </summary>
    public IReadOnlyList<ConservationLaw> ConservationLaws { get; }

    /// <summary>
    /// Indices (increasing) of a maximal set of species whose rows of N are linearly independent; their
    /// counts, with the laws' totals, determine every other count. Size = <see cref="Rank"/>.
    /// </summary>
    public IReadOnlyList<int> IndependentSpecies { get; }

    /// <summary>
    /// Indices (increasing) of the species fixed by the laws given the independent ones; entry k is the
    /// species law k was built to solve for. Chosen as late in declaration order as possible.
    /// </summary>
    public IReadOnlyList<int> DependentSpecies { get; }

    /// <summary>Indices (increasing) of the species no reaction changes (zero rows of N).</summary>
    public IReadOnlyList<int> UnchangedSpecies { get; }

    /// <summary>
    /// Most entries of N (species × reactions) the exact analysis takes on: it eliminates a dense matrix of
    /// arbitrary-precision integers, tens of bytes per entry, so 4·10⁶ entries stay near 100 MB. Beyond it
    /// the structure is not analysed (the callers say so); a 30 000-reaction chain otherwise needed over 14 GB.
    /// </summary>
    public const long MaxAnalysedEntries = 4_000_000;

    /// <summary>Whether N is small enough for <see cref="Analyze"/> (see <see cref="MaxAnalysedEntries"/>).</summary>
    public static bool IsAnalysable(Stoichiometry n) => (long)n.SpeciesCount * n.ReactionCount <= MaxAnalysedEntries;

    /// <summary>Why a network's structure was not analysed, in one sentence.</summary>
    public static string TooLargeNote(Stoichiometry n) =>
        $"the exact structure of N (rank, conservation laws) is not analysed: N has {(long)n.SpeciesCount * n.ReactionCount:N0} entries ({n.SpeciesCount:N0} species × {n.ReactionCount:N0} reactions), more than the {MaxAnalysedEntries:N0} the exact analysis handles in bounded memory";

    /// <summary>Analyses N and evaluates the laws' totals at the initial counts.</summary>
    /// <param name="n">The stoichiometric matrix.</param>
    /// <param name="initialCounts">xᵢ(0), one copy number per species in declaration order.</param>
    /// <exception cref="ArgumentException">The number of initial counts is not the number of species.</exception>
    /// <exception cref="OverflowException">A coefficient or a total does not fit in a 64-bit integer.</exception>
    public static StoichiometricStructure Analyze(Stoichiometry n, IReadOnlyList<long> initialCounts)
    {
        ArgumentNullException.ThrowIfNull(n);
        ArgumentNullException.ThrowIfNull(initialCounts);
        if (!IsAnalysable(n)) throw new ArgumentException(TooLargeNote(n), nameof(n));
        var speciesCount = n.SpeciesCount;
        if (initialCounts.Count != speciesCount)
            throw new ArgumentException(
                $"the network has {speciesCount} species but {initialCounts.Count} initial counts were given",
                nameof(initialCounts));

        var transposed = ExactMatrix.ToRows(n.ToDense(), transpose: true);
        var pivots = ExactMatrix.Reduce(transposed);
        var isPivot = new bool[speciesCount];
        foreach (var p in pivots) isPivot[p] = true;
        var free = Enumerable.Range(0, speciesCount).Where(i => !isPivot[i]).ToArray();

        var vectors = free.Select(f => NullVector(transposed, pivots, f, speciesCount)).ToArray();
        MakeReadable(vectors);
        var laws = vectors.Select(v => ToLaw(v, initialCounts)).ToArray();

        var unchanged = Enumerable.Range(0, speciesCount)
            .Where(i => Enumerable.Range(0, n.ReactionCount).All(j => n[i, j] == 0))
            .ToArray();
        return new StoichiometricStructure(pivots.Length, laws, pivots, free, unchanged);
    }

    /// <summary>Exact rank of an integer matrix of any shape (0 for an empty matrix).</summary>
    public static int RankOf(long[,] matrix)
    {
        ArgumentNullException.ThrowIfNull(matrix);
        return ExactMatrix.Rank(matrix);
    }

    // Solves reduced·x = 0 with x_free = 1 (other free species 0), scaled to the smallest integer vector.
    private static BigInteger[] NullVector(BigInteger[][] reduced, int[] pivots, int free, int speciesCount)
    {
        var scale = BigInteger.One;
        for (var k = 0; k < pivots.Length; k++)
        {
            var d = reduced[k][pivots[k]];
            scale = scale / BigInteger.GreatestCommonDivisor(scale, d) * d;
        }
        var v = new BigInteger[speciesCount];
        v[free] = scale;
        for (var k = 0; k < pivots.Length; k++)
            v[pivots[k]] = -reduced[k][free] * (scale / reduced[k][pivots[k]]);
        ExactMatrix.MakePrimitive(v, firstNonzeroPositive: true);
        return v;
    }

    private static void MakeReadable(BigInteger[][] laws)
    {
        bool replaced;
        do
        {
            replaced = false;
            for (var k = 0; k < laws.Length; k++)
            {
                var better = FirstImprovement(laws, k);
                if (better is null) continue;
                laws[k] = better;
                replaced = true;
            }
        } while (replaced);
    }

    private static BigInteger[]? FirstImprovement(BigInteger[][] laws, int k)
    {
        var negatives = CountNegative(laws[k]);
        if (negatives == 0) return null;
        var support = CountNonzero(laws[k]);
        for (var j = 0; j < laws.Length; j++)
        {
            if (j == k) continue;
            foreach (var sign in (ReadOnlySpan<int>)[1, -1])
            {
                var candidate = new BigInteger[laws[k].Length];
                for (var i = 0; i < candidate.Length; i++) candidate[i] = laws[k][i] + sign * laws[j][i];
                ExactMatrix.MakePrimitive(candidate, firstNonzeroPositive: true);
                if (CountNegative(candidate) < negatives && CountNonzero(candidate) <= support) return candidate;
            }
        }
        return null;
    }

    private static int CountNegative(BigInteger[] v) => v.Count(x => x.Sign < 0);

    private static int CountNonzero(BigInteger[] v) => v.Count(x => !x.IsZero);

    private static ConservationLaw ToLaw(BigInteger[] v, IReadOnlyList<long> initialCounts)
    {
        var total = BigInteger.Zero;
        var coefficients = new long[v.Length];
        for (var i = 0; i < v.Length; i++)
        {
            if (v[i] < long.MinValue || v[i] > long.MaxValue)
                throw new OverflowException(
                    $"a conservation law has coefficient {v[i]} for species number {i + 1} (declaration order), beyond the 64-bit integer range");
            coefficients[i] = (long)v[i];
            total += v[i] * initialCounts[i];
        }
        if (total < long.MinValue || total > long.MaxValue)
            throw new OverflowException(
                $"the total {total} of a conservation law at the initial counts is beyond the 64-bit integer range");
        return new ConservationLaw(coefficients, (long)total);
    }
}
