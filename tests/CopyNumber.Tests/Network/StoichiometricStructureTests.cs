using System.Numerics;
using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

/// <summary>
/// Rank, conservation laws and the independent/dependent split of N. Theory: conservation relations are
/// the left null space of N (Heinrich &amp; Schuster 1996, The Regulation of Cellular Systems, ch. 2);
/// independent species and the link matrix (Reder 1988, J. Theor. Biol. 135:175).
/// Every case also goes through <see cref="AssertStructure"/>, which checks the defining properties
/// directly: cᵀN = 0 in exact integers, dimension = species − rank, linear independence, Reder's split.
/// </summary>
public sealed class StoichiometricStructureTests
{
    [Fact]
    public void EnzymeConservesFreePlusBoundEnzymeAndTotalSubstrate()
    {
        // E + S <-> ES -> E + P conserves E + ES = E_T and S + ES + P = S_T (Segel 1993, Enzyme Kinetics,
        // ch. 2; Cornish-Bowden 2012, Fundamentals of Enzyme Kinetics, ch. 2).
        string[] species = ["E", "S", "ES", "P"];
        long[,] n =
        {
            //  bind unbind cat
            { -1, +1, +1 }, // E
            { -1, +1, 0 },  // S
            { +1, -1, -1 }, // ES
            { 0, 0, +1 },   // P
        };
        long[] x0 = [10, 100, 0, 0];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 2);
        Assert.Equal([new ConservationLaw([1, 0, 1, 0], 10), new ConservationLaw([0, 1, 1, 1], 100)], s.ConservationLaws);
        Assert.Equal([0, 1], s.IndependentSpecies);
        Assert.Equal([2, 3], s.DependentSpecies); // the later species are the dependent ones
        Assert.Empty(s.UnchangedSpecies);
        Assert.Equal("E + ES = 10", s.ConservationLaws[0].Describe(species));
        Assert.Equal("S + ES + P = 100", s.ConservationLaws[1].Describe(species));
        Assert.Equal([1, 2, 3], s.ConservationLaws[1].Species);
    }

    [Fact]
    public void TwoStatePromoterConservesItsGeneCopy()
    {
        // Promoter switching g_off <-> g_on, transcription g_on -> g_on + M, M -> 0, translation
        // M -> M + P, P -> 0: only g_off + g_on is conserved (the two-state gene of Peccoud & Ycart 1995,
        // Theor. Popul. Biol. 48:222; quoted from memory).
        string[] species = ["g_off", "g_on", "M", "P"];
        long[,] n =
        {
            { -1, +1, 0, 0, 0, 0 },
            { +1, -1, 0, 0, 0, 0 },
            { 0, 0, +1, -1, 0, 0 },
            { 0, 0, 0, 0, +1, -1 },
        };
        long[] x0 = [1, 0, 0, 0];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 3);
        Assert.Equal([new ConservationLaw([1, 1, 0, 0], 1)], s.ConservationLaws);
        Assert.Equal([0, 2, 3], s.IndependentSpecies);
        Assert.Equal([1], s.DependentSpecies);
        Assert.Equal("g_off + g_on = 1", s.ConservationLaws[0].Describe(species));
    }

    [Fact]
    public void DimerisationConservesMonomerUnits()
    {
        // 2 P <-> D: each dimer holds two monomers, so P + 2 D is conserved (mass balance; Heinrich &
        // Schuster 1996, ch. 2).
        long[,] n =
        {
            { -2, +2 }, // P
            { +1, -1 }, // D
        };
        long[] x0 = [40, 10];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 1);
        Assert.Equal([new ConservationLaw([1, 2], 60)], s.ConservationLaws);
        Assert.Equal([0], s.IndependentSpecies);
        Assert.Equal([1], s.DependentSpecies);
        Assert.Equal("P + 2 D = 60", s.ConservationLaws[0].Describe(["P", "D"]));
    }

    [Fact]
    public void ClosedCycleConservesItsTotal()
    {
        // A -> B -> C -> A: A + B + C is the only law (Heinrich & Schuster 1996, ch. 2).
        long[,] n =
        {
            { -1, 0, +1 },
            { +1, -1, 0 },
            { 0, +1, -1 },
        };
        long[] x0 = [7, 0, 2];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 2);
        Assert.Equal([new ConservationLaw([1, 1, 1], 9)], s.ConservationLaws);
        Assert.Equal([2], s.DependentSpecies);
        Assert.Equal("A + B + C = 9", s.ConservationLaws[0].Describe(["A", "B", "C"]));
    }

    [Fact]
    public void BirthDeathHasNoLaw()
    {
        // 0 -> A -> 0: N = (1 -1) has full row rank, so the left null space is {0} (common practice).
        long[,] n = { { +1, -1 } };
        long[] x0 = [5];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 1);
        Assert.Empty(s.ConservationLaws);
        Assert.Equal([0], s.IndependentSpecies);
        Assert.Empty(s.DependentSpecies);
    }

    [Fact]
    public void PairCreationConservesADifference()
    {
        // 0 <-> A + B: A and B appear and vanish together, so A - B is conserved (by hand: the single
        // column direction (1, 1) is orthogonal to (1, -1)).
        long[,] n =
        {
            { +1, -1 },
            { +1, -1 },
        };
        long[] x0 = [5, 2];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 1);
        Assert.Equal([new ConservationLaw([1, -1], 3)], s.ConservationLaws);
        Assert.Equal("A - B = 3", s.ConservationLaws[0].Describe(["A", "B"]));
    }

    [Fact]
    public void DependentReactionsLowerTheRankButMakeNoLaw()
    {
        // A -> B, B -> C, A -> C, C -> 0: the third column is the sum of the first two, so the rank (3) is
        // below the reaction count (4), yet the rows stay independent: no conservation law (by hand).
        long[,] n =
        {
            { -1, 0, -1, 0 },
            { +1, -1, 0, 0 },
            { 0, +1, +1, -1 },
        };
        long[] x0 = [3, 0, 0];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 3);
        Assert.Empty(s.ConservationLaws);
        Assert.Equal([0, 1, 2], s.IndependentSpecies);
    }

    [Fact]
    public void UnchangedSpeciesKeepTheirInitialCount()
    {
        // Constitutive expression G -> G + M, M -> 0 with a spectator X in no reaction: the gene G and X
        // have zero rows of N, so G = G(0) and X = X(0) are laws, as unit vectors (common practice).
        string[] species = ["G", "M", "X"];
        long[,] n =
        {
            { 0, 0 },
            { +1, -1 },
            { 0, 0 },
        };
        long[] x0 = [1, 4, 12];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 1);
        Assert.Equal([0, 2], s.UnchangedSpecies);
        Assert.Equal([new ConservationLaw([1, 0, 0], 1), new ConservationLaw([0, 0, 1], 12)], s.ConservationLaws);
        Assert.Equal("G = 1", s.ConservationLaws[0].Describe(species));
        Assert.Equal("X = 12", s.ConservationLaws[1].Describe(species));
    }

    [Fact]
    public void NetworkWithoutReactionsConservesEverySpecies()
    {
        // With no columns every species is unchanged: the left null space is the whole space (by hand).
        var n = new long[2, 0];
        long[] x0 = [3, 8];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 0);
        Assert.Equal([new ConservationLaw([1, 0], 3), new ConservationLaw([0, 1], 8)], s.ConservationLaws);
    }

    [Theory]
    [InlineData(30, 40, 12, 1)]
    [InlineData(25, 10, 7, 2)]
    [InlineData(8, 20, 8, 3)]
    [InlineData(20, 20, 1, 4)]
    public void ProductOfKnownRankGivesAFullExactBasis(int species, int reactions, int rank, int seed)
    {
        // N = U·V with U (species × rank) holding an identity block among its rows and V (rank × reactions)
        // an identity block among its columns: U is injective and V surjective, so rank(N) = rank exactly
        // (Sylvester's rank inequality; any linear algebra text, e.g. Horn & Johnson, Matrix Analysis).
        var random = new Random(seed);
        var u = WithIdentityBlock(species, rank, rowsHoldIdentity: true, random);
        var v = WithIdentityBlock(rank, reactions, rowsHoldIdentity: false, random);
        var n = Multiply(u, v);
        var x0 = Enumerable.Range(0, species).Select(_ => (long)random.Next(0, 1000)).ToArray();

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        Assert.Equal(rank, StoichiometricStructure.RankOf(n));
        Assert.Equal(rank, StoichiometricStructure.RankOf(Transpose(n))); // row rank = column rank
        AssertStructure(n, x0, s, expectedRank: rank);
    }

    [Fact]
    public void EntriesNearTenToTheTwelveAreHandledExactly()
    {
        // Rows r1 = (10^12, 10^12 + 1), r2 = (10^12 - 1, 10^12) have determinant 10^24 - (10^24 - 1) = 1,
        // so they are independent; r3 = r1 + r2. Exactly: rank 2 and the single law X + Y - Z (by hand).
        // In double precision the two products round to the same number (their spacing near 10^24 is
        // 2^27), the determinant comes out 0 and elimination would report rank 1 and a second, false law.
        const long t = 1_000_000_000_000;
        long[,] n =
        {
            { t, t + 1 },
            { t - 1, t },
            { 2 * t - 1, 2 * t + 1 },
        };
        long[] x0 = [4, 5, 6];
        double a = t, b = t + 1, c = t - 1, d = t;
        Assert.Equal(0.0, a * d - b * c);
        Assert.Equal(BigInteger.One, (BigInteger)t * t - (BigInteger)(t + 1) * (t - 1));

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 2);
        Assert.Equal([new ConservationLaw([1, 1, -1], 3)], s.ConservationLaws);
        Assert.Equal("X + Y - Z = 3", s.ConservationLaws[0].Describe(["X", "Y", "Z"]));
    }

    [Fact]
    public void BigCoefficientsComeOutPrimitive()
    {
        // One reaction changing A by 10^12 and B by -(10^12 + 1): the integer vectors orthogonal to (a, b)
        // are the multiples of (b, -a)/gcd(a, b), here (10^12 + 1, 10^12) since consecutive integers are
        // coprime (elementary number theory, by hand).
        const long t = 1_000_000_000_000;
        long[,] n = { { t }, { -(t + 1) } };
        long[] x0 = [3, 4];

        var s = StoichiometricStructure.Analyze(new Stoichiometry(n), x0);

        AssertStructure(n, x0, s, expectedRank: 1);
        Assert.Equal([new ConservationLaw([t + 1, t], 7 * t + 3)], s.ConservationLaws);
        Assert.Equal("1000000000001 A + 1000000000000 B = 7000000000003", s.ConservationLaws[0].Describe(["A", "B"]));
    }

    [Fact]
    public void RankOfKnownMatrices()
    {
        // [[1,2,3],[4,5,6],[7,8,9]] has rank 2 (the standard singular example, Strang, Introduction to
        // Linear Algebra); a Vandermonde matrix on distinct nodes is invertible (det = Π (x_j - x_i));
        // rows r1, r2, r1 + r2, 2 r1 - 3 r2 span a plane; zero and empty matrices have rank 0.
        Assert.Equal(2, StoichiometricStructure.RankOf(new long[,] { { 1, 2, 3 }, { 4, 5, 6 }, { 7, 8, 9 } }));
        var vandermonde = new long[5, 5];
        for (var i = 0; i < 5; i++)
            for (var j = 0; j < 5; j++)
                vandermonde[i, j] = (long)Math.Pow(i + 1, j);
        Assert.Equal(5, StoichiometricStructure.RankOf(vandermonde));
        long[] r1 = [3, -1, 4, 1, -5, 9], r2 = [2, 6, -5, 3, 5, -8];
        var plane = new long[4, 6];
        for (var j = 0; j < 6; j++)
        {
            plane[0, j] = r1[j];
            plane[1, j] = r2[j];
            plane[2, j] = r1[j] + r2[j];
            plane[3, j] = 2 * r1[j] - 3 * r2[j];
        }
        Assert.Equal(2, StoichiometricStructure.RankOf(plane));
        Assert.Equal(0, StoichiometricStructure.RankOf(new long[3, 4]));
        Assert.Equal(0, StoichiometricStructure.RankOf(new long[0, 0]));
        Assert.Equal(0, StoichiometricStructure.RankOf(new long[0, 3]));
        Assert.Equal(0, StoichiometricStructure.RankOf(new long[3, 0]));
    }

    [Fact]
    public void RankAtTheEdgesOfTheLongRange()
    {
        // det [[max, min], [min, max]] = max² - min² = (2^63 - 1)² - 2^126 = 1 - 2^64 ≠ 0 (by hand, checked
        // in BigInteger below); [[min, min], [1, 1]] has equal columns.
        var max = long.MaxValue;
        var min = long.MinValue;
        Assert.Equal(BigInteger.One - BigInteger.Pow(2, 64), (BigInteger)max * max - (BigInteger)min * min);
        Assert.Equal(2, StoichiometricStructure.RankOf(new[,] { { max, min }, { min, max } }));
        Assert.Equal(1, StoichiometricStructure.RankOf(new[,] { { min, min }, { 1L, 1L } }));
    }

    [Fact]
    public void DescribeWritesSignsAndCoefficients()
    {
        // Formatting convention of ConservationLaw.Describe: species order, coefficient 1 left out,
        // zero terms skipped (common practice for writing linear equations).
        string[] names = ["A", "B", "C", "D"];
        Assert.Equal("-B + 2 C - 3 D = -5", new ConservationLaw([0, -1, 2, -3], -5).Describe(names));
        Assert.Equal("-9223372036854775808 A = 0", new ConservationLaw([long.MinValue, 0, 0, 0], 0).Describe(names));
        Assert.Equal("0 = 0", new ConservationLaw([0, 0, 0, 0], 0).Describe(names));
        var error = Assert.Throws<ArgumentException>(() => new ConservationLaw([1, 1], 2).Describe(names));
        Assert.Contains("2 species", error.Message);
    }

    [Fact]
    public void LawsCompareByValue()
    {
        // Record equality over the coefficient values, not the list instance (common practice).
        Assert.Equal(new ConservationLaw([1, 2], 3), new ConservationLaw(new List<long> { 1, 2 }, 3));
        Assert.NotEqual(new ConservationLaw([1, 2], 3), new ConservationLaw([1, 2], 4));
        Assert.NotEqual(new ConservationLaw([1, 2], 3), new ConservationLaw([2, 1], 3));
    }

    [Fact]
    public void WrongNumberOfInitialCountsIsReported()
    {
        var n = new Stoichiometry(new long[,] { { 1 }, { -1 } });
        var error = Assert.Throws<ArgumentException>(() => StoichiometricStructure.Analyze(n, [1, 2, 3]));
        Assert.Contains("2 species but 3 initial counts", error.Message);
    }

    [Fact]
    public void CoefficientBeyondLongIsReported()
    {
        // Columns (p, 1, 0) and (0, q, 1) have left null vector (1, -p, p·q) (their cross product, by hand);
        // with p = q = 2^40 the last coefficient is 2^80.
        const long p = 1L << 40;
        long[,] n = { { p, 0 }, { 1, p }, { 0, 1 } };
        var error = Assert.Throws<OverflowException>(() => StoichiometricStructure.Analyze(new Stoichiometry(n), [0, 0, 0]));
        Assert.Contains(BigInteger.Pow(2, 80).ToString(), error.Message);
    }

    [Fact]
    public void TotalBeyondLongIsReported()
    {
        // A <-> B conserves A + B (by hand); with A(0) = long.MaxValue and B(0) = 1 the total overflows.
        long[,] n = { { -1, 1 }, { 1, -1 } };
        var error = Assert.Throws<OverflowException>(() =>
            StoichiometricStructure.Analyze(new Stoichiometry(n), [long.MaxValue, 1]));
        Assert.Contains("total", error.Message);
    }

    /// <summary>
    /// Checks the defining properties: each law satisfies cᵀN = 0 exactly, is primitive with its first
    /// nonzero coefficient positive, and its total is Σ cᵢ·xᵢ(0); there are species − rank laws and they
    /// are linearly independent (so they span the left null space); independent species have independent
    /// rows of N, the laws restricted to the dependent species are invertible (Reder 1988); unchanged
    /// species are exactly the zero rows and each has its unit law.
    /// </summary>
    private static void AssertStructure(long[,] n, long[] x0, StoichiometricStructure s, int expectedRank)
    {
        var species = n.GetLength(0);
        var reactions = n.GetLength(1);
        Assert.Equal(expectedRank, s.Rank);
        Assert.Equal(expectedRank, StoichiometricStructure.RankOf(n));
        Assert.Equal(species - expectedRank, s.ConservationLaws.Count);

        foreach (var law in s.ConservationLaws)
        {
            var c = law.Coefficients;
            Assert.Equal(species, c.Count);
            for (var j = 0; j < reactions; j++)
            {
                var dot = BigInteger.Zero;
                for (var i = 0; i < species; i++) dot += (BigInteger)c[i] * n[i, j];
                Assert.Equal(BigInteger.Zero, dot);
            }
            Assert.Equal(BigInteger.One, c.Aggregate(BigInteger.Zero, (g, x) => BigInteger.GreatestCommonDivisor(g, x)));
            Assert.True(c.First(x => x != 0) > 0, $"first coefficient of {law} must be positive");
            var total = BigInteger.Zero;
            for (var i = 0; i < species; i++) total += (BigInteger)c[i] * x0[i];
            Assert.Equal(total, (BigInteger)law.Total);
            Assert.Equal(Enumerable.Range(0, species).Where(i => c[i] != 0), law.Species);
        }
        var lawMatrix = new long[s.ConservationLaws.Count, species];
        for (var k = 0; k < s.ConservationLaws.Count; k++)
            for (var i = 0; i < species; i++)
                lawMatrix[k, i] = s.ConservationLaws[k].Coefficients[i];
        Assert.Equal(s.ConservationLaws.Count, StoichiometricStructure.RankOf(lawMatrix));

        Assert.Equal(expectedRank, s.IndependentSpecies.Count);
        Assert.Equal(s.ConservationLaws.Count, s.DependentSpecies.Count);
        Assert.Equal(Enumerable.Range(0, species), s.IndependentSpecies.Concat(s.DependentSpecies).Order());
        Assert.Equal(s.IndependentSpecies.Order(), s.IndependentSpecies);
        Assert.Equal(s.DependentSpecies.Order(), s.DependentSpecies);
        Assert.Equal(expectedRank, StoichiometricStructure.RankOf(SelectRows(n, s.IndependentSpecies)));
        Assert.Equal(s.ConservationLaws.Count, StoichiometricStructure.RankOf(SelectColumns(lawMatrix, s.DependentSpecies)));

        var zeroRows = Enumerable.Range(0, species).Where(i => Enumerable.Range(0, reactions).All(j => n[i, j] == 0));
        Assert.Equal(zeroRows, s.UnchangedSpecies);
        foreach (var i in s.UnchangedSpecies)
            Assert.Contains(s.ConservationLaws, law => law.Species.SequenceEqual([i]) && law.Coefficients[i] == 1);
    }

    // A matrix whose rows (or columns) include an identity block at random positions, other entries in [-3, 3].
    private static long[,] WithIdentityBlock(int rows, int columns, bool rowsHoldIdentity, Random random)
    {
        var m = new long[rows, columns];
        for (var i = 0; i < rows; i++)
            for (var j = 0; j < columns; j++)
                m[i, j] = random.Next(-3, 4);
        var longSide = rowsHoldIdentity ? rows : columns;
        var block = rowsHoldIdentity ? columns : rows;
        var positions = Enumerable.Range(0, longSide).OrderBy(_ => random.Next()).Take(block).ToArray();
        for (var k = 0; k < block; k++)
            for (var l = 0; l < block; l++)
            {
                var value = k == l ? 1L : 0L;
                if (rowsHoldIdentity) m[positions[k], l] = value;
                else m[l, positions[k]] = value;
            }
        return m;
    }

    private static long[,] Multiply(long[,] a, long[,] b)
    {
        var product = new long[a.GetLength(0), b.GetLength(1)];
        for (var i = 0; i < a.GetLength(0); i++)
            for (var j = 0; j < b.GetLength(1); j++)
                for (var k = 0; k < a.GetLength(1); k++)
                    product[i, j] += a[i, k] * b[k, j];
        return product;
    }

    private static long[,] Transpose(long[,] m)
    {
        var t = new long[m.GetLength(1), m.GetLength(0)];
        for (var i = 0; i < m.GetLength(0); i++)
            for (var j = 0; j < m.GetLength(1); j++)
                t[j, i] = m[i, j];
        return t;
    }

    private static long[,] SelectRows(long[,] m, IReadOnlyList<int> rows)
    {
        var result = new long[rows.Count, m.GetLength(1)];
        for (var r = 0; r < rows.Count; r++)
            for (var j = 0; j < m.GetLength(1); j++)
                result[r, j] = m[rows[r], j];
        return result;
    }

    private static long[,] SelectColumns(long[,] m, IReadOnlyList<int> columns) => Transpose(SelectRows(Transpose(m), columns));
}
